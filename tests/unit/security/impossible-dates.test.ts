// Finding 8 (issue 17): impossible calendar dates in assembly and item dates answered 500 (the
// database refused what validation let through). Leap years by the Gregorian rule (divisible by 4,
// not by 100 unless by 400; ISO 8601 uses the proleptic Gregorian calendar).
import { describe, expect, it } from "vitest";
import { assemblyInput, itemInput } from "@/lib/validation/assemblies";
import { isCalendarDate } from "@/lib/validation/dates";
import { queueSendInput } from "@/lib/validation/queue";

describe("calendar dates", () => {
  it("refuses days that do not exist, and years the DATE type does not hold", () => {
    for (const d of ["2026-02-31", "2026-02-29", "2100-02-29", "2026-04-31", "2026-13-01", "2026-00-10", "2026-01-00", "0999-12-31", "2026-1-01", "2026-01-01T00:00"]) expect(isCalendarDate(d), d).toBe(false);
  });

  it("takes real days, leap days included", () => {
    for (const d of ["2026-02-28", "2024-02-29", "2000-02-29", "2026-12-31", "1000-01-01", "9999-12-31"]) expect(isCalendarDate(d), d).toBe(true);
  });

  it("assembly, item and queue inputs refuse 2026-02-31 as a field error (422), not a database error", () => {
    expect(assemblyInput.safeParse({ name: "Frame", targetDate: "2026-02-31" }).success).toBe(false);
    expect(assemblyInput.safeParse({ name: "Frame", targetDate: "2026-02-28" }).success).toBe(true);
    const item = itemInput.safeParse({ kind: "hardware", name: "M3 nut", quantity: 4, dueDate: "2026-02-31" });
    expect(item.success).toBe(false);
    expect(queueSendInput.safeParse({ partId: 1, quantity: 1, wishedDate: "2026-02-31", priority: 0 }).success).toBe(false);
  });
});
