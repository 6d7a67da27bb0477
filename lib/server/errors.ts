import "server-only";
import { NextResponse } from "next/server";
import { ZodError } from "zod";

export type ErrorCode = "bad_request" | "unauthenticated" | "forbidden" | "not_found" | "conflict" | "too_large" | "invalid" | "unavailable";

const statusOf: Record<ErrorCode, number> = {
  bad_request: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  too_large: 413,
  invalid: 422,
  unavailable: 503,
};

/** An error the user may see: its message is safe to show. */
export class AppError extends Error {
  constructor(
    public readonly code: ErrorCode,
    message: string,
    public readonly fieldErrors?: Record<string, string[]>,
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

/** Maps any thrown value to a JSON response; unknown errors are logged and answered generically. */
export function errorResponse(e: unknown): NextResponse {
  if (e instanceof AppError) {
    return NextResponse.json({ error: e.message, code: e.code, fieldErrors: e.fieldErrors }, { status: e.status });
  }
  if (e instanceof ZodError) {
    return NextResponse.json(
      { error: "Some fields are not valid.", code: "invalid", fieldErrors: zodFieldErrors(e) },
      { status: 422 },
    );
  }
  if (isDbDown(e)) {
    return NextResponse.json({ error: "The database is not reachable right now. Try again shortly.", code: "unavailable" }, { status: 503 });
  }
  console.error("[platewright] unexpected error", e);
  return NextResponse.json({ error: "Something went wrong on our side.", code: "internal" }, { status: 500 });
}

/** Reads a JSON body with a clear 400 for anything that is not a JSON object. */
export async function readJson(req: Request, maxBytes = 1_000_000): Promise<unknown> {
  const type = req.headers.get("content-type") ?? "";
  if (!type.toLowerCase().startsWith("application/json")) {
    throw new AppError("bad_request", "Send the request body as application/json.");
  }
  // Refuse a declared oversize body before reading any of it.
  const declared = Number(req.headers.get("content-length") ?? "");
  if (Number.isFinite(declared) && declared > maxBytes) throw new AppError("too_large", `The request body is larger than ${maxBytes} bytes.`);
  const text = await req.text().catch(() => {
    throw new AppError("bad_request", "The request body could not be read.");
  });
  if (text.length > maxBytes) throw new AppError("too_large", `The request body is larger than ${maxBytes} bytes.`);
  try {
    return JSON.parse(text);
  } catch {
    throw new AppError("bad_request", "The request body is not valid JSON.");
  }
}
