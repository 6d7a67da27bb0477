import { describe, expect, it } from "vitest";
import { quoteAssembly, quoteCost, roundCents } from "@/lib/estimate";

const PRINTER = { hourlyRateCents: 350 };
const PETG = { pricePerKgCents: 2499 };

describe("quote of one job", () => {
  it("matches a hand-worked example with a fee and a half cent", () => {
    // Hand arithmetic (invented job): 37.5 g of PETG at 24.99/kg, 2 h 15 min at 3.50/h, fee 1.50.
    //   material = 37.5 × 2499 / 1000 = 93.7125   → 94 cents (nearest cent)
    //   machine  = 135 / 60 × 350     = 787.5     → 788 cents (half rounds up)
    //   fee      =                                  150 cents
    //   total    = 94 + 788 + 150                 = 1032 cents
    expect(quoteCost({ grams: 37.5, minutes: 135 }, PRINTER, PETG, 150)).toEqual({
      materialCents: 94,
      machineCents: 788,
      feeCents: 150,
      totalCents: 1032,
    });
  });

  it("leaves the fee out when none is set", () => {
    // 100 g × 20.00/kg = 200 cents; 60 min × 3.50/h = 350 cents (hand arithmetic).
    expect(quoteCost({ grams: 100, minutes: 60 }, PRINTER, { pricePerKgCents: 2000 })).toEqual({
      materialCents: 200,
      machineCents: 350,
      feeCents: 0,
      totalCents: 550,
    });
  });

  it("rounds halves up and shrugs off float noise", () => {
    // Nearest cent, halves up (rounding rule of quote.ts; common practice, no source).
    expect(roundCents(0.5)).toBe(1);
    expect(roundCents(2.4999)).toBe(2);
    expect(roundCents(787.4999999999999)).toBe(788);
    // 1.005 is stored as 1.00499999999999989…; × 100 it must still count as 100.5 → 101.
    expect(roundCents(1.005 * 100)).toBe(101);
  });

  it("refuses negative amounts and fractional fees", () => {
    expect(() => quoteCost({ grams: -1, minutes: 10 }, PRINTER, PETG)).toThrow(RangeError);
    expect(() => quoteCost({ grams: 1, minutes: 10 }, PRINTER, PETG, 1.5)).toThrow(RangeError);
  });
});

describe("quote of an assembly", () => {
  it("adds its parts' rounded lines by quantity and the fee once", () => {
    // Hand arithmetic (invented assembly), PETG at 24.99/kg and 3.50/h:
    //   housing × 1: 37.5 g → 94, 135 min → 788
    //   clip    × 4: 2.2 g × 2499 / 1000 = 5.4978 → 5; 12 min × 350 / 60 = 70 → 70
    //   material = 94 + 4 × 5 = 114; machine = 788 + 4 × 70 = 1068; fee 250 once
    //   total    = 114 + 1068 + 250 = 1432 cents
    const housing = quoteCost({ grams: 37.5, minutes: 135 }, PRINTER, PETG);
    const clip = quoteCost({ grams: 2.2, minutes: 12 }, PRINTER, PETG);
    const q = quoteAssembly(
      [
        { label: "housing", cost: housing },
        { label: "clip", cost: clip, quantity: 4 },
      ],
      250,
    );
    expect(q.materialCents).toBe(114);
    expect(q.machineCents).toBe(1068);
    expect(q.feeCents).toBe(250);
    expect(q.totalCents).toBe(1432);
    expect(q.lines.map((l) => l.totalCents)).toEqual([882, 300]);
    // The lines shown add up to the total shown.
    expect(q.lines.reduce((s, l) => s + l.totalCents, 0) + q.feeCents).toBe(q.totalCents);
  });

  it("ignores fees carried by the part quotes", () => {
    const withFee = quoteCost({ grams: 10, minutes: 10 }, PRINTER, PETG, 500);
    expect(quoteAssembly([{ cost: withFee }], 0).totalCents).toBe(withFee.totalCents - 500);
  });
});
