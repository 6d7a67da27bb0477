import "server-only";
import { NextResponse } from "next/server";
import { ZodError } from "zod";

export type ErrorCode = "bad_request" | "unauthenticated" | "forbidden" | "not_found" | "conflict" | "too_large" | "invalid" | "too_many" | "unavailable" | "cross_origin";

const statusOf: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid: 422,
  too_many: 429,
  unavailable: 503,
  cross_origin: 403,
};

/** An error the user may see: its message is safe to show. */
export class AppError extends Error {
  constructor(
    public readonly code: ErrorCode,
    message: string,
    public readonly fieldErrors?: Record<string, string[]>,
    /** Seconds, sent as Retry-After (with too_many and unavailable). */
    public readonly retryAfterS?: number,
  ) {
    super(message);
    this.name = "AppError";
  }
  get status(): number {
    return statusOf[this.code];
  }
}

export function zodFieldErrors(e: ZodError): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const issue of e.issues) {
    const key = issue.path.join(".") || "_";
    (out[key] ??= []).push(issue.message);
  }
  return out;
}

const DB_DOWN_CODES = new Set(["ECONNREFUSED", "ECONNRESET", "PROTOCOL_CONNECTION_LOST", "ETIMEDOUT", "ER_CON_COUNT_ERROR", "EPIPE"]);

/** True when the error (or one it wraps: drizzle wraps driver errors in `cause`) says the database is unreachable. */
export function isDbDown(e: unknown): boolean {
  for (let cur: unknown = e, depth = 0; cur && depth < 5; depth++) {
    const code = (cur as { code?: string }).code;
    if (code && DB_DOWN_CODES.has(code)) return true;
    cur = (cur as { cause?: unknown }).cause;
  }
  return false;
}

/** The database error code of `e` or of any error it wraps (drizzle puts the driver's error in `cause`). */
export function dbErrorCode(e: unknown): string | null {
  for (let cur: unknown = e, depth = 0; cur && depth < 5; depth++) {
    const code = (cur as { code?: unknown }).code;
    if (typeof code === "string" && (code.startsWith("ER_") || DB_DOWN_CODES.has(code))) return code;
    cur = (cur as { cause?: unknown }).cause;
  }
  return null;
}

export type DbErrorKind = "down" | "duplicate" | "busy" | "other";

/** What kind of database failure `e` is, looking through wrapped causes. */
export function dbErrorKind(e: unknown): DbErrorKind | null {
  const code = dbErrorCode(e);
  if (!code) return null;
  if (DB_DOWN_CODES.has(code)) return "down";
  if (code === "ER_DUP_ENTRY") return "duplicate";
  if (code === "ER_LOCK_WAIT_TIMEOUT" || code === "ER_LOCK_DEADLOCK") return "busy";
  return "other";
}

/** Plain words for a database failure, never the SQL text (which names tables, columns and values). */
export function dbErrorMessage(kind: DbErrorKind): string {
  switch (kind) {
    case "down":
      return "The database is not reachable right now. Try again shortly.";
    case "busy":
      return "The workshop's data is busy with another change. Try again in a moment.";
    case "duplicate":
      return "That already exists.";
    default:
      return "Something went wrong on our side.";
  }
}

/** Maps any thrown value to a JSON response; unknown errors are logged and answered generically. */
export function errorResponse(e: unknown): NextResponse {
  if (e instanceof AppError) {
    return NextResponse.json({ error: e.message, code: e.code, fieldErrors: e.fieldErrors }, { status: e.status, headers: e.retryAfterS ? { "Retry-After": String(e.retryAfterS) } : undefined });
  }
  if (e instanceof ZodError) {
    return NextResponse.json(
      { error: "Some fields are not valid.", code: "invalid", fieldErrors: zodFieldErrors(e) },
      { status: 422 },
    );
  }
  const kind = dbErrorKind(e);
  if (kind === "down") return NextResponse.json({ error: dbErrorMessage(kind), code: "unavailable" }, { status: 503 });
  if (kind === "busy") return NextResponse.json({ error: dbErrorMessage(kind), code: "unavailable" }, { status: 503, headers: { "Retry-After": "2" } });
  console.error("[platewright] unexpected error", e);
  return NextResponse.json({ error: "Something went wrong on our side.", code: "internal" }, { status: 500 });
}

/**
 * Reads a request body as text, at most `maxBytes` bytes. A declared Content-Length over the cap is
 * refused before anything is read; a body without one (chunked) is counted as it streams and the read
 * is cancelled, with 413, as soon as it passes the cap, so a huge body is never held in memory.
 */
export async function readBodyText(req: Request, maxBytes: number): Promise<string> {
  const tooLarge = () => new AppError("too_large", `The request body is larger than the limit of ${maxBytes} bytes.`);
  const declared = Number(req.headers.get("content-length") ?? "");
  if (Number.isFinite(declared) && declared > maxBytes) throw tooLarge();
  if (!req.body) return "";
  const reader = req.body.getReader();
  const chunks: Uint8Array[] = [];
  let size = 0;
  for (;;) {
    let step: ReadableStreamReadResult<Uint8Array>;
    try {
      step = await reader.read();
    } catch {
      throw new AppError("bad_request", "The request body could not be read.");
    }
    if (step.done) break;
    size += step.value.byteLength;
    if (size > maxBytes) {
      await reader.cancel().catch(() => undefined);
      throw tooLarge();
    }
    chunks.push(step.value);
  }
  const all = new Uint8Array(size);
  let at = 0;
  for (const c of chunks) {
    all.set(c, at);
    at += c.byteLength;
  }
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(all);
  } catch {
    throw new AppError("bad_request", "The request body is not valid UTF-8 text.");
  }
}

/** Reads a JSON body with a clear 400 for anything that is not JSON, and 413 past `maxBytes` (counted while reading). */
export async function readJson(req: Request, maxBytes = 1_000_000): Promise<unknown> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("application/json")) {
    throw new AppError("bad_request", "Send the request body as application/json.");
  }
  const text = await readBodyText(req, maxBytes);
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
}
