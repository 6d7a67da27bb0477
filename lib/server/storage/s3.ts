import "server-only";
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client } from "@aws-sdk/client-s3";
import { createReadStream } from "node:fs";
import { stat, unlink } from "node:fs/promises";
import { checkKey, type BlobStore } from "./types";

export interface S3Options {
  bucket: string;
  endpoint?: string;
  region: string;
  accessKeyId: string;
  secretAccessKey: string;
  /** Object key prefix, e.g. "meshes/". */
  prefix?: string;
}

/** S3-compatible object storage: one object per key; the temporary file is uploaded, then removed. */
export class S3Store implements BlobStore {
  readonly kind = "s3" as const;
  private readonly client: S3Client;
  constructor(private readonly o: S3Options) {
    this.client = new S3Client({
      region: o.region,
      endpoint: o.endpoint,
      // Self-hosted S3-compatible servers usually want bucket-in-path addressing.
      forcePathStyle: Boolean(o.endpoint),
      // The SDK's default streams uploads with aws-chunked trailing checksums, which several
      // S3-compatible servers store verbatim (the chunk framing ends up in the object): send plain bodies.
      requestChecksumCalculation: "WHEN_REQUIRED",
      responseChecksumValidation: "WHEN_REQUIRED",
      credentials: { accessKeyId: o.accessKeyId, secretAccessKey: o.secretAccessKey },
    });
  }

  private objectKey(key: string): string {
    return `${this.o.prefix ?? ""}${checkKey(key)}`;
  }

  async has(key: string): Promise<boolean> {
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.o.bucket, Key: this.objectKey(key) }));
      return true;
    } catch (e) {
      const status = (e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode;
      if (status === 404 || (e as Error).name === "NotFound") return false;
      throw e;
    }
  }

  async putFile(key: string, tempPath: string): Promise<boolean> {
    try {
      if (await this.has(key)) return false;
      const { size } = await stat(tempPath);
      await this.client.send(
        new PutObjectCommand({ Bucket: this.o.bucket, Key: this.objectKey(key), Body: createReadStream(tempPath), ContentLength: size, ContentType: "application/octet-stream" }),
      );
      return true;
    } finally {
      await unlink(tempPath).catch(() => undefined);
    }
  }

  private async body(key: string) {
    const r = await this.client.send(new GetObjectCommand({ Bucket: this.o.bucket, Key: this.objectKey(key) }));
    if (!r.Body) throw new Error(`object ${key} has no body`);
    return r.Body;
  }

  async read(key: string): Promise<Uint8Array> {
    return (await this.body(key)).transformToByteArray();
  }

  async stream(key: string): Promise<ReadableStream<Uint8Array>> {
    return (await this.body(key)).transformToWebStream() as ReadableStream<Uint8Array>;
  }

  async delete(key: string): Promise<void> {
    await this.client.send(new DeleteObjectCommand({ Bucket: this.o.bucket, Key: this.objectKey(key) }));
  }
}
