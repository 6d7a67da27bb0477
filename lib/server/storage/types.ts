/** Where uploaded mesh bytes live. Keys are the SHA-256 of the bytes in lower-case hex. */
export interface BlobStore {
  readonly kind: "local" | "s3";
  has(key: string): Promise<boolean>;
  /**
   * Moves a finished temporary file into place under `key`. Returns true when the bytes were new,
   * false when they were already stored. The temporary file is gone afterwards either way.
   */
  putFile(key: string, tempPath: string): Promise<boolean>;
  read(key: string): Promise<Uint8Array>;
  stream(key: string): Promise<ReadableStream<Uint8Array>>;
  delete(key: string): Promise<void>;
}

export function checkKey(key: string): string {
  if (!/^[0-9a-f]{64}$/.test(key)) throw new Error(`not a storage key: ${key.slice(0, 80)}`);
  return key;
}
