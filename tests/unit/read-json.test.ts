// readJson's size cap on a body without Content-Length: it counts while the stream is read and stops
// reading at the cap (413), instead of trusting a declared length. Limits and codes: RFC 9110 §15.5.14
// (413 Content Too Large); the rest is common practice, no source.
import { describe, expect, it } from "vitest";
import { AppError, readJson } from "@/lib/server/errors";

/** An endless stream of 16 KiB chunks of "x" after `{"a":"`, counting what was pulled and whether it was cancelled. */
function endless() {
  const seen = { bytes: 0, cancelled: false };
  const chunk = new TextEncoder().encode("x".repeat(16 * 1024));
  let first = true;
  const body = new ReadableStream<Uint8Array>({
    pull(c) {
      const part = first ? new TextEncoder().encode('{"a":"') : chunk;
      first = false;
      seen.bytes += part.byteLength;
      c.enqueue(part);
    },
    cancel() {
      seen.cancelled = true;
    },
  });
  return { body, seen };
}

const jsonRequest = (body: BodyInit, headers: Record<string, string> = {}) =>
  new Request("http://127.0.0.1/x", { method: "POST", body, headers: { "content-type": "application/json", ...headers }, duplex: "half" } as RequestInit);

describe("readJson", () => {
  it("stops an endless body without Content-Length at the cap with 413 and cancels the stream", async () => {
    const { body, seen } = endless();
    const err = await readJson(jsonRequest(body), 100_000).catch((e: unknown) => e);
    expect(err).toBeInstanceOf(AppError);
    expect((err as AppError).status).toBe(413);
    expect((err as AppError).message).toMatch(/larger than the limit of 100000 bytes/);
    expect(seen.cancelled).toBe(true);
    // Read no further than the cap plus the chunks already queued.
    expect(seen.bytes).toBeLessThan(100_000 + 4 * 16 * 1024);
  });

  it("refuses a declared Content-Length over the cap before reading", async () => {
    const { body, seen } = endless();
    const err = await readJson(jsonRequest(body, { "content-length": "100001" }), 100_000).catch((e: unknown) => e);
    expect((err as AppError).status).toBe(413);
    expect(seen.bytes).toBeLessThan(64 * 1024);
  });

  it("reads a streamed body under the cap, including multi-byte text split across chunks", async () => {
    const bytes = new TextEncoder().encode(JSON.stringify({ name: "Grüße 3 mm" }));
    const body = new ReadableStream<Uint8Array>({
      start(c) {
        for (const b of bytes) c.enqueue(new Uint8Array([b]));
        c.close();
      },
    });
    expect(await readJson(jsonRequest(body), 1000)).toEqual({ name: "Grüße 3 mm" });
  });

  it("answers 400 for malformed JSON and for a wrong content type", async () => {
    await expect(readJson(jsonRequest("{nope"))).rejects.toMatchObject({ status: 400 });
    await expect(readJson(new Request("http://127.0.0.1/x", { method: "POST", body: "{}", headers: { "content-type": "text/plain" } }))).rejects.toMatchObject({ status: 400 });
  });

  it("allows a body of exactly the cap", async () => {
    const text = JSON.stringify({ a: "x".repeat(100 - 8) });
    expect(text.length).toBe(100);
    expect(await readJson(jsonRequest(text), 100)).toEqual({ a: "x".repeat(92) });
  });
});
