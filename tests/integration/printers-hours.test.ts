// Opening hours stored in the database come back into the calendar and give the right next
// opening in the workshop's zone, across a daylight-saving change and across midnight.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { eq } from "drizzle-orm";
import { closeDb, db } from "@/db";
import { workshopSettings } from "@/db/schema";
import { AppError } from "@/lib/server/errors";
import { attendedHoursView, getAttendedCalendar, getAttendedWindows, setAttendedHours } from "@/lib/server/hours";
import type { SessionUser } from "@/lib/server/session";
import { attendedHoursInput } from "@/lib/validation/hours";

const admin: SessionUser = { id: 9201, email: "a@test.example", name: "Test Admin", role: "admin" };
const operator: SessionUser = { id: 9202, email: "o@test.example", name: "Test Operator", role: "operator" };

const week = attendedHoursInput.parse({
  windows: [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "09:00", close: "21:00" })).concat([{ weekday: 6, open: "10:00", close: "16:00" }]),
});

/** UTC offset of a zone at an instant, read from Intl (the IANA tz database), e.g. "GMT+02:00". */
function offsetAt(tz: string, t: number): string {
  const parts = new Intl.DateTimeFormat("en-GB", { timeZone: tz, timeZoneName: "longOffset" }).formatToParts(new Date(t));
  return parts.find((p) => p.type === "timeZoneName")?.value ?? "";
}

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test Workshop", timezone: "Europe/Berlin", currency: "EUR", plateFeeCents: 150 });
  await db().update(workshopSettings).set({ timezone: "Europe/Berlin" }).where(eq(workshopSettings.id, 1));
});
afterAll(closeDb);

describe("attended hours", () => {
  it("only an admin sets them", async () => {
    await expect(setAttendedHours(operator, week)).rejects.toBeInstanceOf(AppError);
    await setAttendedHours(admin, week);
    expect(await getAttendedWindows()).toEqual(week.windows);
  });

  it("after Saturday's closing on the weekend summer time ends, the next opening is Monday 09:00 CET", async () => {
    // EU summer time ends on the last Sunday of October at 01:00 UTC (Directive 2000/84/EC):
    // 25 October 2026. Saturday 24 Oct 17:00 CEST (UTC+2) = 15:00Z; Monday 26 Oct 09:00 CET (UTC+1) = 08:00Z.
    const sat = Date.UTC(2026, 9, 24, 15, 0);
    const mon = Date.UTC(2026, 9, 26, 8, 0);
    expect(offsetAt("Europe/Berlin", sat)).toBe("GMT+02:00");
    expect(offsetAt("Europe/Berlin", mon)).toBe("GMT+01:00");
    const cal = await getAttendedCalendar();
    expect(cal.isOpen(sat)).toBe(false);
    expect(cal.nextOpening(sat)).toBe(mon);
    // Sat 17:00 to Mon 09:00 is 40 hours of wall clock, but the clocks go back an hour in between:
    // 41 hours elapse. A naive wall-clock count would open an hour early.
    expect((mon - sat) / 3_600_000).toBe(41);
    const view = await attendedHoursView(new Date(sat));
    expect(view).toMatchObject({ timezone: "Europe/Berlin", openNow: false, nextOpeningAt: new Date(mon).toISOString(), nextOpeningLocal: "Mon 26 Oct, 09:00" });
  });

  it("on the spring change, Monday 30 March opens at 09:00 CEST = 07:00Z", async () => {
    // Summer time starts on the last Sunday of March at 01:00 UTC (Directive 2000/84/EC): 29 March 2026.
    const sunNoon = Date.UTC(2026, 2, 29, 10, 0);
    const cal = await getAttendedCalendar();
    expect(cal.nextOpening(sunNoon)).toBe(Date.UTC(2026, 2, 30, 7, 0));
    expect(offsetAt("Europe/Berlin", Date.UTC(2026, 2, 30, 7, 0))).toBe("GMT+02:00");
  });

  it("a window past midnight is open after midnight and closes the next morning", async () => {
    const late = attendedHoursInput.parse({ windows: [{ weekday: 5, open: "22:00", close: "02:00" }] });
    await setAttendedHours(admin, late);
    const cal = await getAttendedCalendar();
    // Friday 4 Dec 2026 22:00 CET = 21:00Z; Saturday 01:00 CET = 00:00Z is still inside it.
    const satOne = Date.UTC(2026, 11, 5, 0, 0);
    expect(cal.isOpen(satOne)).toBe(true);
    expect(cal.closingAfter(satOne)).toBe(Date.UTC(2026, 11, 5, 1, 0));
    // From Saturday 03:00 CET the next opening is the following Friday 22:00 CET.
    expect(cal.nextOpening(Date.UTC(2026, 11, 5, 2, 0))).toBe(Date.UTC(2026, 11, 11, 21, 0));
    await setAttendedHours(admin, week);
  });

  it("refuses a weekday twice, bad times and unknown fields", () => {
    expect(attendedHoursInput.safeParse({ windows: [{ weekday: 1, open: "09:00", close: "12:00" }, { weekday: 1, open: "13:00", close: "17:00" }] }).error?.issues[0]?.path).toEqual(["windows", 1, "weekday"]);
    expect(attendedHoursInput.safeParse({ windows: [{ weekday: 8, open: "09:00", close: "12:00" }] }).success).toBe(false);
    expect(attendedHoursInput.safeParse({ windows: [{ weekday: 1, open: "9:00", close: "12:00" }] }).error?.issues[0]?.path).toEqual(["windows", 0, "open"]);
    expect(attendedHoursInput.safeParse({ windows: [{ weekday: 1, open: "09:00", close: "25:00" }] }).success).toBe(false);
    expect(attendedHoursInput.safeParse({ windows: [], timezone: "UTC" }).success).toBe(false);
  });
});
