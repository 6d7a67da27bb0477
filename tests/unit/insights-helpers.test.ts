// Pure insights helpers: nearest-rank percentiles, periods in the workshop's zone, CSV.
import { describe, expect, it } from "vitest";
import { toCsv, formatNumber } from "@/lib/insights/csv";
import { hourBuckets, resolvePeriod, trendBuckets } from "@/lib/insights/period";
import { nearestRank } from "@/lib/insights/percentile";
import { insightsQuery } from "@/lib/validation/insights";

describe("nearest-rank percentile", () => {
  it("matches the textbook worked example on {15, 20, 35, 40, 50}", () => {
    // Nearest-rank method, worked example in the "Percentile" article (Wikipedia): the 5th, 30th,
    // 40th, 50th and 100th percentiles of 15, 20, 35, 40, 50 are 15, 20, 20, 35 and 50.
    const xs = [50, 15, 40, 20, 35];
    expect([0.05, 0.3, 0.4, 0.5, 1].map((p) => nearestRank(xs, p))).toEqual([15, 20, 20, 35, 50]);
  });
  it("matches the second worked example on {3, 6, 7, 8, 8, 10, 13, 15, 16, 20}", () => {
    // Same source: 25th → 7, 50th → 8, 75th → 15, 100th → 20.
    const xs = [3, 6, 7, 8, 8, 10, 13, 15, 16, 20];
    expect([0.25, 0.5, 0.75, 1].map((p) => nearestRank(xs, p))).toEqual([7, 8, 15, 20]);
  });
  it("is empty for no values and refuses p outside 0..1", () => {
    expect(nearestRank([], 0.5)).toBeNull();
    expect(() => nearestRank([1], 1.5)).toThrow();
  });
});

describe("periods in the workshop's zone", () => {
  const tz = "Europe/Berlin";
  it("a month to date starts at local midnight on the 1st and ends now", () => {
    // Wed 2 Dec 2026 05:00Z; Berlin is CET (UTC+1) in December, so the 1st starts at 30 Nov 23:00Z.
    const now = Date.UTC(2026, 11, 2, 5);
    const p = resolvePeriod({ period: "month" }, tz, now);
    expect([p.from, p.to, p.start, p.end]).toEqual(["2026-12-01", "2026-12-02", Date.UTC(2026, 10, 30, 23), now]);
  });
  it("a week starts on Monday", () => {
    // Sun 6 Dec 2026 → Monday 30 Nov.
    const p = resolvePeriod({ period: "week" }, tz, Date.UTC(2026, 11, 6, 12));
    expect(p.from).toBe("2026-11-30");
  });
  it("a custom week over the autumn clock change is 169 hours, tiled by 169 hour buckets", () => {
    // EU summer time ends Sun 25 Oct 2026 at 01:00 UTC (Directive 2000/84/EC): that Sunday has 25 hours.
    const p = resolvePeriod({ period: "custom", from: "2026-10-19", to: "2026-10-25" }, tz, Date.UTC(2027, 0, 1));
    expect((p.end - p.start) / 3_600_000).toBe(7 * 24 + 1);
    const hb = hourBuckets(p);
    expect(hb.reduce((s, b) => s + (b.end - b.start), 0)).toBe(p.end - p.start);
    for (let i = 1; i < hb.length; i++) expect(hb[i]!.start).toBe(hb[i - 1]!.end);
    expect(hb[0]).toMatchObject({ weekday: 1, hour: 0, start: p.start });
    // Sunday's hours in order: 00, 01, then 02 twice (CEST, then CET), 03 …
    expect(hb.filter((b) => b.weekday === 7).map((b) => b.hour).slice(0, 5)).toEqual([0, 1, 2, 2, 3]);
    // Trend by day: seven local days, the last 25 hours long.
    const tb = trendBuckets(p);
    expect(tb.map((b) => b.label)).toEqual(["2026-10-19", "2026-10-20", "2026-10-21", "2026-10-22", "2026-10-23", "2026-10-24", "2026-10-25"]);
    expect((tb[6]!.end - tb[6]!.start) / 3_600_000).toBe(25);
  });
  it("validates custom periods with messages per field", () => {
    const bad = insightsQuery.safeParse({ period: "custom", from: "2026-02-30", to: "2026-01-01" });
    expect(bad.success).toBe(false);
    expect(bad.error?.issues.map((i) => i.path.join("."))).toContain("from");
    expect(insightsQuery.safeParse({ period: "custom", from: "2026-03-05", to: "2026-03-01" }).error?.issues[0]?.path).toEqual(["to"]);
    expect(insightsQuery.safeParse({ period: "month", extra: "1" }).success).toBe(false);
    expect(insightsQuery.parse({})).toMatchObject({ period: "month", format: "json" });
  });
});

describe("CSV", () => {
  it("quotes and line-ends as RFC 4180 §2 says, with dot decimals and no grouping", () => {
    const csv = toCsv({ columns: [{ key: "a", label: "Reason" }, { key: "b", label: "Hours", digits: 2 }], rows: [{ a: 'Stringy, "wet" filament', b: 12345.678 }, { a: "x", b: null }] });
    expect(csv).toBe('Reason,Hours\r\n"Stringy, ""wet"" filament",12345.68\r\nx,\r\n');
    expect(formatNumber(-0.001, 2)).toBe("0.00");
  });
});
