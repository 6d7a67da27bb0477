// Insights aggregates on a small hand-made history: every expected figure below is worked out by
// hand from the rows this file inserts (arithmetic in the comments), none is read back from the code.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { assemblies, attendedHours, charges, materials, partInstances, parts, plateItems, plates, printerMaintenance, printers, printHistory, queueEntries, spools, users, workshopSettings } from "@/db/schema";
import { chartTable } from "@/lib/insights/tables";
import { toCsv } from "@/lib/insights/csv";
import { nearestRank } from "@/lib/insights/percentile";
import { AppError } from "@/lib/server/errors";
import { getInsights } from "@/lib/server/insights";
import type { SessionUser } from "@/lib/server/session";

// Period: Mon 2 and Tue 3 March 2026 in Europe/Berlin, which is CET = UTC+1 then (EU summer time
// starts on the last Sunday of March, Directive 2000/84/EC). 48 hours; attended Mon–Fri 09–17, so
// 2 × 8 = 16 h open and 32 h closed.
const Q = { period: "custom" as const, from: "2026-03-02", to: "2026-03-03" };
const NOW = Date.UTC(2026, 2, 10, 12);
/** Local Berlin wall time in March 2026 (UTC+1) as a Date. */
const L = (day: number, hh: number, mm = 0) => new Date(Date.UTC(2026, 2, day, hh - 1, mm));
const H = 3_600_000;

let admin: SessionUser, operator: SessionUser, member: SessionUser, m1: SessionUser, m2: SessionUser;
const ids: Record<string, number> = {};

async function person(email: string, role: SessionUser["role"]): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role, passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

async function printer(name: string): Promise<number> {
  const [r] = await db().insert(printers).values({ name, bedXMm: 200, bedYMm: 200, heightMm: 200 }).$returningId();
  return r!.id;
}

async function plate(printerId: number, status: "finished" | "failed" | "cancelled", start: Date, end: Date, o: { material: string; colour?: string; estMin?: number; estG?: number; actMin?: number; actG?: number | null; reason?: string }): Promise<number> {
  const [r] = await db()
    .insert(plates)
    .values({ printerId, status, material: o.material, colour: o.colour ?? "white", plannedStart: start, plannedEnd: end, startedAt: start, endedAt: end, estimatedMinutes: o.estMin ?? 60, estimatedGrams: o.estG ?? 10, actualMinutes: o.actMin ?? null, actualGrams: o.actG ?? null, reason: o.reason ?? null, quote: {}, quotedAt: start })
    .$returningId();
  return r!.id;
}

let copyNo = 0;
/** A part copy of the member's, sent to the queue `waitH` hours before `printedAt`. */
async function copy(owner: SessionUser, partId: number, printedAt: Date | null, waitH: number): Promise<number> {
  const [i] = await db().insert(partInstances).values({ partId, copyNo: ++copyNo, status: "printed" }).$returningId();
  await db().insert(queueEntries).values({ instanceId: i!.id, memberId: owner.id, sentBy: owner.id, sentAt: new Date((printedAt?.getTime() ?? L(1, 0).getTime()) - waitH * H) });
  return i!.id;
}

async function item(plateId: number, instanceId: number, memberId: number, grams: number) {
  await db().insert(plateItems).values({ plateId, instanceId, memberId, x: 0, y: 0, sizeX: 10, sizeY: 10, sizeZ: 10, minutes: 10, grams });
}

async function partOf(owner: SessionUser): Promise<number> {
  const [a] = await db().insert(assemblies).values({ ownerId: owner.id, name: `${owner.name} kit` }).$returningId();
  const [p] = await db().insert(parts).values({ assemblyId: a!.id, name: "Bracket", layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
  return p!.id;
}

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Insights test shop", timezone: "Europe/Berlin", currency: "EUR" });
  await db().update(workshopSettings).set({ timezone: "Europe/Berlin", currency: "EUR" }).where(eq(workshopSettings.id, 1));
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5].map((weekday) => ({ weekday, opensAt: "09:00", closesAt: "17:00" })));
  admin = await person("ins-admin@test.example", "admin");
  operator = await person("ins-op@test.example", "operator");
  member = await person("ins-member@test.example", "member");
  m1 = await person("ins-m1@test.example", "member");
  m2 = await person("ins-m2@test.example", "member");
  const A = (ids.A = await printer("INS Alder"));
  const B = (ids.B = await printer("INS Birch"));
  const C = (ids.C = await printer("INS Cedar"));

  // Alder. P1 finished Mon 08:00–12:00 (4 h: 1 h closed, 3 h open); P2 failed Mon 16:00–20:00
  // (1 h open, 3 h closed); P3 finished Sun 22:00 → Mon 02:00, clipped to Mon 00:00–02:00 (2 h closed).
  const p1 = await plate(A, "finished", L(2, 8), L(2, 12), { material: "pla", colour: "White", estMin: 200, actMin: 240, estG: 50, actG: 55 });
  const p2 = await plate(A, "failed", L(2, 16), L(2, 20), { material: "pla", reason: "Warped corner" });
  const p3 = await plate(A, "finished", L(1, 22), L(2, 2), { material: "petg", colour: "black", estMin: 240, actMin: 240, estG: 40, actG: null });
  // A failed plate the day before the period: outside every figure except that P1 reprints its copy.
  const p0 = await plate(A, "failed", L(1, 10), L(1, 12), { material: "pla", reason: "Lifted off the bed" });
  // Birch. P4 failed Tue 10:00–11:30 (1.5 h open); P7 failed Tue 14:00–15:00 (1 h open);
  // P5 finished Tue 22:00 → Wed 01:00, clipped to Tue 22:00–24:00 (2 h closed), ended after the period;
  // P6 cancelled: never counted.
  const p4 = await plate(B, "failed", L(3, 10), L(3, 11, 30), { material: "pla", reason: "  warped CORNER " });
  const p7 = await plate(B, "failed", L(3, 14), L(3, 15), { material: "petg", reason: "Nozzle clog" });
  await plate(B, "finished", L(3, 22), L(4, 1), { material: "pla", estMin: 180, actMin: 180 });
  await plate(B, "cancelled", L(3, 12), L(3, 13), { material: "pla", reason: "Wrong colour" });
  // Cedar: maintenance Mon 12:00 → Tue 12:00 (24 h: open Mon 12–17 = 5 h + Tue 09–12 = 3 h = 8 h) and
  // from Tue 20:00 with no end yet, clipped to Tue 20–24 (4 h closed).
  await db().insert(printerMaintenance).values([
    { printerId: C, startsAt: L(2, 12), endsAt: L(3, 12), note: "New hot end" },
    { printerId: C, startsAt: L(3, 20), endsAt: null, note: "Belt tension" },
  ]);
  // Print history of the finished plates (P5 finished Wednesday, outside the period).
  await db().insert(printHistory).values([
    { printerId: A, plateId: p1, estimatedMinutes: 200, actualMinutes: 240, estimatedGrams: 50, actualGrams: 55, finishedAt: L(2, 12) },
    { printerId: A, plateId: p3, estimatedMinutes: 240, actualMinutes: 240, estimatedGrams: 40, actualGrams: null, finishedAt: L(2, 2) },
    { printerId: B, estimatedMinutes: 180, actualMinutes: 180, estimatedGrams: 30, actualGrams: 30, finishedAt: L(4, 1) },
  ]);

  // Copies and waits. P1: m1 10 g ×3 (waits 2, 4, 7 h), m2 20 g (3 h; it failed on P0 first).
  // P3: m1 20 g (12 h), m1 10 g (30 h), m2 10 g (10 h). P2 and P7 carry the same m1 copy; P4 an m2 copy.
  const k1 = await partOf(m1);
  const k2 = await partOf(m2);
  for (const [g, w] of [[10, 2], [10, 4], [10, 7]] as const) await item(p1, await copy(m1, k1, L(2, 12), w), m1.id, g);
  const again = await copy(m2, k2, L(2, 12), 3);
  await item(p0, again, m2.id, 20);
  await item(p1, again, m2.id, 20);
  await item(p3, await copy(m1, k1, L(2, 2), 12), m1.id, 20);
  await item(p3, await copy(m1, k1, L(2, 2), 30), m1.id, 10);
  await item(p3, await copy(m2, k2, L(2, 2), 10), m2.id, 10);
  const twice = await copy(m1, k1, null, 50);
  await item(p2, twice, m1.id, 15);
  await item(p7, twice, m1.id, 15);
  await item(p4, await copy(m2, k2, null, 50), m2.id, 12);

  // Spools: PLA white 300 + 500 (two spellings of one colour), PETG black 120.
  const [pla] = await db().insert(materials).values({ name: "INS PLA", type: "pla", densityGcm3: 1.24, densitySource: "test", pricePerKgCents: 2000 }).$returningId();
  const [petg] = await db().insert(materials).values({ name: "INS PETG", type: "petg", densityGcm3: 1.27, densitySource: "test", pricePerKgCents: 2500 }).$returningId();
  await db().insert(spools).values([
    { materialId: pla!.id, label: "INS-1", colour: "white", gramsInitial: 1000, gramsRemaining: 300 },
    { materialId: pla!.id, label: "INS-2", colour: "White", gramsInitial: 1000, gramsRemaining: 500 },
    { materialId: petg!.id, label: "INS-3", colour: "Black", gramsInitial: 1000, gramsRemaining: 120 },
  ]);
  // Charges: m1 12.00 + 3.50 in the period, m2 8.00 in it and 9.99 the week before.
  await db().insert(charges).values([
    { memberId: m1.id, amountCents: 1200, currency: "EUR", description: "t", idempotencyKey: "ins:1", createdAt: L(2, 12) },
    { memberId: m1.id, amountCents: 350, currency: "EUR", description: "t", idempotencyKey: "ins:2", createdAt: L(3, 9) },
    { memberId: m2.id, amountCents: 800, currency: "EUR", description: "t", idempotencyKey: "ins:3", createdAt: L(2, 13) },
    { memberId: m2.id, amountCents: 999, currency: "EUR", description: "t", idempotencyKey: "ins:4", createdAt: new Date(Date.UTC(2026, 1, 23, 9)) },
  ]);
});
afterAll(closeDb);

describe("insights on a hand-made history", () => {
  it("refuses members", async () => {
    await expect(getInsights(member, Q, NOW)).rejects.toMatchObject({ code: "forbidden" });
    await expect(getInsights(member, Q, NOW)).rejects.toBeInstanceOf(AppError);
  });

  it("splits each printer's 48 hours into printing, idle open, idle closed and maintenance", async () => {
    const d = await getInsights(admin, Q, NOW);
    expect(d.period.hours).toBe(48);
    const row = (name: string) => d.utilisation.find((u) => u.printer === name)!;
    // Alder: printing 4 + 4 + 2 = 10 h (4 h of it open); idle open 16 − 4 = 12; idle closed 32 − 6 = 26.
    expect(row("INS Alder")).toMatchObject({ printingH: 10, idleOpenH: 12, idleClosedH: 26, maintenanceH: 0 });
    expect(row("INS Alder").utilisationPct).toBeCloseTo((100 * 10) / 48, 9);
    // Birch: printing 1.5 + 1 + 2 = 4.5 h (2.5 open); idle open 16 − 2.5 = 13.5; idle closed 32 − 2 = 30.
    expect(row("INS Birch")).toMatchObject({ printingH: 4.5, idleOpenH: 13.5, idleClosedH: 30, maintenanceH: 0 });
    // Cedar: maintenance 24 + 4 = 28 h (8 open); idle open 16 − 8 = 8; idle closed 32 − 20 = 12.
    expect(row("INS Cedar")).toMatchObject({ printingH: 0, idleOpenH: 8, idleClosedH: 12, maintenanceH: 28 });
    for (const u of d.utilisation) expect(u.printingH + u.idleOpenH + u.idleClosedH + u.maintenanceH).toBeCloseTo(48, 9);
  });

  it("puts printing hours in the right local weekday and hour", async () => {
    const d = await getInsights(admin, Q, NOW);
    const cell = (wd: number, h: number) => d.heatmap.find((c) => c.weekday === wd && c.hour === h)!.hours;
    expect(d.heatmap).toHaveLength(7 * 24);
    expect(cell(1, 0)).toBe(1); // P3, Mon 00–01
    expect(cell(1, 1)).toBe(1);
    expect(cell(1, 2)).toBe(0);
    expect(cell(1, 8)).toBe(1); // P1
    expect(cell(2, 11)).toBe(0.5); // P4 ends Tue 11:30
    expect(cell(2, 23)).toBe(1); // P5, clipped at Tue 24:00
    // The grid holds all printing: Alder 10 h + Birch 4.5 h.
    expect(d.heatmap.reduce((s, c) => s + c.hours, 0)).toBeCloseTo(14.5, 9);
  });

  it("files both 02:00 hours of the autumn clock change under Sunday 02", async () => {
    // EU summer time ends Sun 25 Oct 2026 at 01:00 UTC (Directive 2000/84/EC): 00:00Z is 02:00 CEST,
    // 01:00Z is 02:00 CET again, 02:00Z is 03:00 CET. A plate 00:00Z–02:30Z prints 2 h in "02" and 0.5 h in "03".
    const id = await plate(ids.A!, "finished", new Date(Date.UTC(2026, 9, 25, 0)), new Date(Date.UTC(2026, 9, 25, 2, 30)), { material: "pla" });
    try {
      const d = await getInsights(operator, { period: "custom", from: "2026-10-25", to: "2026-10-25" }, Date.UTC(2026, 10, 1));
      expect(d.period.hours).toBe(25);
      const cell = (h: number) => d.heatmap.find((c) => c.weekday === 7 && c.hour === h)!.hours;
      expect([cell(1), cell(2), cell(3)]).toEqual([0, 2, 0.5]);
    } finally {
      await db().delete(plates).where(eq(plates.id, id));
    }
  });

  it("counts failure rates per printer, material, reason and day, and reprints", async () => {
    const d = await getInsights(admin, Q, NOW);
    const { byPrinter, byMaterial, byReason, trend, reprints } = d.failures;
    // Ended in the period: Alder P1, P3 finished, P2 failed → 1/3; Birch P4, P7 failed → 2/2; Cedar none.
    expect(byPrinter.find((r) => r.label === "INS Alder")).toMatchObject({ finished: 2, failed: 1 });
    expect(byPrinter.find((r) => r.label === "INS Alder")!.ratePct).toBeCloseTo(100 / 3, 9);
    expect(byPrinter.find((r) => r.label === "INS Birch")).toMatchObject({ finished: 0, failed: 2, ratePct: 100 });
    expect(byPrinter.find((r) => r.label === "INS Cedar")).toMatchObject({ finished: 0, failed: 0, ratePct: null });
    // PLA: P1 finished; P2, P4 failed → 2/3. PETG: P3 finished, P7 failed → 1/2.
    expect(byMaterial.find((r) => r.label === "PLA")!.ratePct).toBeCloseTo(200 / 3, 9);
    expect(byMaterial.find((r) => r.label === "PETG")).toMatchObject({ finished: 1, failed: 1, ratePct: 50 });
    // "Warped corner" twice (spelt two ways), "Nozzle clog" once: 2/3 and 1/3 of failures.
    expect(byReason.map((r) => [r.reason.toLowerCase(), r.failed])).toEqual([["warped corner", 2], ["nozzle clog", 1]]);
    expect(byReason[0]!.sharePct).toBeCloseTo(200 / 3, 9);
    // By local day: Monday P1, P3 finished and P2 failed; Tuesday P4 and P7 failed.
    expect(trend.map((t) => [t.label, t.finished, t.failed])).toEqual([["2026-03-02", 2, 1], ["2026-03-03", 0, 2]]);
    // Copies on plates that ended: P1 ×4, P3 ×3, P2, P7, P4 = 10; reprints: m2's copy on P1 (failed
    // on P0 first) and m1's on P7 (failed on P2 first) = 2 → 20 %.
    expect(reprints).toEqual({ prints: 10, reprints: 2, sharePct: 20 });
  });

  it("compares estimates with actuals from the print history", async () => {
    const d = await getInsights(admin, Q, NOW);
    const alder = d.estimates.byPrinter.find((r) => r.printer === "INS Alder")!;
    // Minutes: (240 + 240) / (200 + 240) = 480 / 440; grams over weighed plates only: 55 / 50.
    expect(alder).toMatchObject({ plates: 2, estimatedMin: 440, actualMin: 480, weighedPlates: 1, estimatedG: 50, actualG: 55 });
    expect(alder.timeRatio).toBeCloseTo(480 / 440, 9);
    expect(alder.gramsRatio).toBeCloseTo(1.1, 9);
    // Birch's one finished plate ended on Wednesday: nothing in the period.
    expect(d.estimates.byPrinter.find((r) => r.printer === "INS Birch")).toMatchObject({ plates: 0, timeRatio: null });
    expect(d.estimates.points).toHaveLength(2);
  });

  it("adds grams per material and colour, and days of stock at the period's rate", async () => {
    const d = await getInsights(admin, Q, NOW);
    // Finished in the period: P1 PLA white, weighed 55 g; P3 PETG black, not weighed, estimate 40 g.
    expect(d.material.use.map((u) => [u.material, u.colour.toLowerCase(), u.grams])).toEqual([["PLA", "white", 55], ["PETG", "black", 40]]);
    const pla = d.material.stock.find((s) => s.material === "PLA")!;
    // PLA white: 300 + 500 = 800 g on 2 spools; 55 g / 2 days = 27.5 g/day → 800 / 27.5 days.
    expect(pla).toMatchObject({ spools: 2, stockG: 800, gramsPerDay: 27.5 });
    expect(pla.daysLeft).toBeCloseTo(800 / 27.5, 9);
    // PETG black: 120 g at 40 / 2 = 20 g/day → 6 days.
    expect(d.material.stock.find((s) => s.material === "PETG")).toMatchObject({ stockG: 120, gramsPerDay: 20, daysLeft: 6 });
  });

  it("gives parts, grams, charges and nearest-rank waits per member", async () => {
    const d = await getInsights(admin, Q, NOW);
    const r1 = d.members.rows.find((r) => r.memberId === m1.id)!;
    const r2 = d.members.rows.find((r) => r.memberId === m2.id)!;
    // P1 weighed 55 g against 50 g planned (×1.1): m1 30 → 33 g, m2 20 → 22 g. P3 not weighed (×1): m1 30, m2 10.
    expect(r1).toMatchObject({ parts: 5, chargesCents: 1550, waits: 5 });
    expect(r1.grams).toBeCloseTo(63, 9);
    expect(r2).toMatchObject({ parts: 2, chargesCents: 800, waits: 2 });
    expect(r2.grams).toBeCloseTo(32, 9);
    // Nearest rank (rank ⌈p·n⌉): m1 waits 2, 4, 7, 12, 30 h → median rank 3 = 7 h, p90 rank 5 = 30 h;
    // m2 3, 10 h → median rank 1 = 3 h, p90 rank 2 = 10 h; all seven → median rank 4 = 7 h, p90 rank 7 = 30 h.
    expect([r1.waitMedianH, r1.waitP90H, r2.waitMedianH, r2.waitP90H]).toEqual([7, 30, 3, 10]);
    expect(d.members.overall).toEqual({ waits: 7, waitMedianH: 7, waitP90H: 30 });
    // The SQL percentile agrees with the helper on the same sample.
    expect(nearestRank([2, 4, 7, 12, 30, 3, 10], 0.9)).toBe(30);
    expect(d.currency).toBe("EUR");
  });

  it("gives operators the printers but no money", async () => {
    const d = await getInsights(operator, Q, NOW);
    expect(d.utilisation.find((u) => u.printer === "INS Alder")?.printingH).toBe(10);
    expect("currency" in d).toBe(false);
    for (const r of d.members.rows) expect("chargesCents" in r).toBe(false);
    expect(JSON.stringify(d)).not.toMatch(/charge|cents|currency/i);
    const csv = toCsv(chartTable(d, "members"));
    expect(csv.split("\r\n")[0]).not.toMatch(/charge/i);
    expect(toCsv(chartTable(await getInsights(admin, Q, NOW), "members")).split("\r\n")[0]).toMatch(/Charges EUR/);
  });
});
