// Findings 10 and 11 (issue 17): database failures are answered in plain words, never with the SQL
// text drizzle puts in its message, and their codes are found through wrapped causes.
import { describe, expect, it } from "vitest";
import { dbErrorKind, errorResponse } from "@/lib/server/errors";

// The shape drizzle 0.45 throws: its own error with the SQL in the message, the driver's in `cause`.
const wrapped = (code: string) => Object.assign(new Error("Failed query: select `id` from `users` where `email` = ?\nparams: account:x@example.org"), { cause: Object.assign(new Error("driver"), { code }) });

describe("database errors", () => {
  it("walks the cause to find the driver's code", () => {
    expect(dbErrorKind(wrapped("ER_DUP_ENTRY"))).toBe("duplicate");
    expect(dbErrorKind(wrapped("ECONNREFUSED"))).toBe("down");
    expect(dbErrorKind(wrapped("ER_LOCK_WAIT_TIMEOUT"))).toBe("busy");
    expect(dbErrorKind(wrapped("ER_PARSE_ERROR"))).toBe("other");
    expect(dbErrorKind(new Error("plain"))).toBeNull();
  });

  it("answers 503 in plain words, without SQL, when the database is down or busy", async () => {
    for (const code of ["ECONNREFUSED", "ER_LOCK_DEADLOCK"]) {
      const res = errorResponse(wrapped(code));
      expect(res.status).toBe(503);
      const body = (await res.json()) as { error: string };
      expect(body.error).not.toMatch(/select|params|users/i);
    }
  });
});
