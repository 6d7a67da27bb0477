import { describe, expect, it } from "vitest";
import { createAttendedCalendar } from "@/lib/calendar/attended-hours";

// Daylight-saving dates: EU Directive 2000/84/EC, summer time starts the last Sunday of March and
// ends the last Sunday of October, both at 01:00 UTC. In 2026 those Sundays are 29 March and
// 25 October (calendar fact). Europe/Berlin is UTC+1 in winter (CET) and UTC+2 in summer (CEST).
const BERLIN = "Europe/Berlin";
const utc = (s: string) => Date.parse(s);
const H = 3_600_000;

describe("attended hours across daylight-saving changes (EU Directive 2000/84/EC)", () => {
  const cal = createAttendedCalendar(BERLIN, [
    { weekday: 7, open: "00:00", close: "06:00" }, // Sunday night shift, spans the change hour
    { weekday: 1, open: "09:00", close: "17:00" },
  ]);

  it("the spring-forward Sunday 00:00-06:00 lasts 5 real hours, not 6", () => {
    // 29 March 2026 00:00 CET = 28 March 23:00 UTC; 06:00 CEST = 04:00 UTC.
    expect(cal.openMinutesBetween(utc("2026-03-28T00:00Z"), utc("2026-03-30T00:00Z"))).toBe(300);
    expect(cal.nextOpening(utc("2026-03-28T12:00Z"))).toBe(utc("2026-03-28T23:00Z"));
    expect(cal.closingAfter(utc("2026-03-29T01:30Z"))).toBe(utc("2026-03-29T04:00Z"));
  });

  it("the fall-back Sunday 00:00-06:00 lasts 7 real hours", () => {
    // 25 October 2026 00:00 CEST = 24 October 22:00 UTC; 06:00 CET = 05:00 UTC.
    expect(cal.openMinutesBetween(utc("2026-10-24T00:00Z"), utc("2026-10-26T00:00Z"))).toBe(420);
    expect(cal.nextOpening(utc("2026-10-24T12:00Z"))).toBe(utc("2026-10-24T22:00Z"));
    expect(cal.closingAfter(utc("2026-10-25T00:30Z"))).toBe(utc("2026-10-25T05:00Z"));
  });

  it("Monday 09:00 local is 08:00 UTC before the change and 07:00 UTC after", () => {
    expect(cal.nextOpening(utc("2026-03-23T06:00Z"))).toBe(utc("2026-03-23T08:00Z"));
    expect(cal.nextOpening(utc("2026-03-30T06:00Z"))).toBe(utc("2026-03-30T07:00Z"));
    expect(cal.isOpen(utc("2026-03-30T07:30Z"))).toBe(true);
    expect(cal.isOpen(utc("2026-03-30T15:00Z"))).toBe(false); // 17:00 CEST: closed at the closing minute
  });

  it("an overnight window that contains the spring change is an hour short", () => {
    const night = createAttendedCalendar(BERLIN, [{ weekday: 6, open: "22:00", close: "06:00" }]);
    // Saturday 28 March 22:00 CET (21:00 UTC) to Sunday 06:00 CEST (04:00 UTC): 7 hours.
    expect(night.openMinutesBetween(utc("2026-03-28T00:00Z"), utc("2026-03-30T00:00Z"))).toBe(7 * 60);
    // Same window on 24/25 October: 22:00 CEST (20:00 UTC) to 06:00 CET (05:00 UTC): 9 hours.
    expect(night.openMinutesBetween(utc("2026-10-24T00:00Z"), utc("2026-10-26T00:00Z"))).toBe(9 * 60);
  });
});

describe("attended hours across midnight (worked examples, from the definition)", () => {
  // Friday 22:00 to Saturday 02:00; 2026-01-09 is a Friday (calendar fact); Berlin is UTC+1 in January.
  const cal = createAttendedCalendar(BERLIN, [{ weekday: 5, open: "22:00", close: "02:00" }]);

  it("is open after midnight on the following day and closes at 02:00", () => {
    expect(cal.isOpen(utc("2026-01-10T00:00Z"))).toBe(true); // Saturday 01:00 local
    expect(cal.isOpen(utc("2026-01-10T01:00Z"))).toBe(false); // Saturday 02:00 local
    expect(cal.closingAfter(utc("2026-01-09T22:00Z"))).toBe(utc("2026-01-10T01:00Z"));
  });

  it("the next opening after Saturday morning is the following Friday 22:00", () => {
    expect(cal.nextOpening(utc("2026-01-10T08:00Z"))).toBe(utc("2026-01-16T21:00Z"));
    expect(cal.closingAfter(utc("2026-01-10T08:00Z"))).toBe(utc("2026-01-17T01:00Z"));
    expect(cal.openMinutesBetween(utc("2026-01-05T00:00Z"), utc("2026-01-19T00:00Z"))).toBe(2 * 240);
  });

  it("windows that touch at midnight form one spell", () => {
    const two = createAttendedCalendar(BERLIN, [
      { weekday: 1, open: "20:00", close: "24:00" },
      { weekday: 2, open: "00:00", close: "04:00" },
    ]);
    // Monday 2026-01-12 21:00 local = 20:00 UTC; the spell closes Tuesday 04:00 local = 03:00 UTC.
    expect(two.closingAfter(utc("2026-01-12T20:00Z"))).toBe(utc("2026-01-13T03:00Z"));
    expect(two.longestSpellMinutes()).toBe(480);
  });
});

describe("closed days, always open and bad input", () => {
  it("skips closed weekdays", () => {
    const weekdays = createAttendedCalendar("UTC", [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "08:00", close: "16:00" })));
    // 2026-01-10 is a Saturday; the next opening is Monday 12 January 08:00.
    expect(weekdays.nextOpening(new Date("2026-01-10T10:00Z"))).toBe(utc("2026-01-12T08:00Z"));
    expect(weekdays.openMinutesBetween(utc("2026-01-05T00:00Z"), utc("2026-01-12T00:00Z"))).toBe(5 * 480);
  });

  it("open equal to close means the whole day; every day so means no closing", () => {
    const always = createAttendedCalendar(BERLIN, [1, 2, 3, 4, 5, 6, 7].map((weekday) => ({ weekday, open: "00:00", close: "00:00" })));
    const t = utc("2026-03-28T12:00Z");
    expect(always.isOpen(t)).toBe(true);
    expect(always.closingAfter(t)).toBeNull();
    // Elapsed time across the spring change is still 72 real hours.
    expect(always.openMinutesBetween(t, t + 72 * H)).toBe(72 * 60);
  });

  it("a calendar with no windows never opens", () => {
    const none = createAttendedCalendar("UTC", []);
    expect(none.isOpen(0)).toBe(false);
    expect(none.nextOpening(0)).toBeNull();
  });

  it("rejects an unknown zone and malformed times", () => {
    expect(() => createAttendedCalendar("Mars/Olympus", [])).toThrow();
    expect(() => createAttendedCalendar("UTC", [{ weekday: 8, open: "08:00", close: "09:00" }])).toThrow(/weekday/);
    expect(() => createAttendedCalendar("UTC", [{ weekday: 1, open: "8:00", close: "09:00" }])).toThrow(/HH:MM/);
  });
});
