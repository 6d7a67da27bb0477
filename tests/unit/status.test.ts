// Part status rules, checked against the workflow written in issue 4 ("Decisions already made"),
// and the printer-fit rule against hand-worked sizes.
import { describe, expect, it } from "vitest";
import { allowedTargets, countStatuses, fitPrinters, needsReason, partStatuses, planTransition, type PartStatus } from "@/lib/status";

// The table of who moves what (source: issue 4, decisions already made).
const member: [PartStatus, PartStatus][] = [["drafted", "ready"], ["ready", "drafted"], ["ready", "queued"], ["printed", "accepted"]];
const workshop: [PartStatus, PartStatus][] = [["queued", "plated"], ["plated", "printing"], ["printing", "printed"], ["printing", "failed"]];

describe("planTransition", () => {
  it("allows exactly the member's moves from the issue, and only with edit rights", () => {
    for (const from of partStatuses) for (const to of partStatuses) {
      const listed = member.some(([a, b]) => a === from && b === to);
      expect(planTransition({ from, to, role: "member", canEdit: true, reason: "r" }).ok, `${from}→${to}`).toBe(listed);
      expect(planTransition({ from, to, role: "member", canEdit: false, reason: "r" }).ok).toBe(false);
    }
  });

  it("allows the workshop's moves and cancels back to the queue, for operators and admins alike", () => {
    for (const role of ["operator", "admin"] as const) {
      for (const [from, to] of workshop) expect(planTransition({ from, to, role, canEdit: false, reason: "r" }).ok).toBe(true);
      for (const from of ["plated", "printing", "printed", "accepted"] as const) expect(planTransition({ from, to: "queued", role, canEdit: false, reason: "cancelled" }).ok).toBe(true);
      expect(planTransition({ from: "drafted", to: "ready", role, canEdit: false }).ok).toBe(false);
      expect(planTransition({ from: "printed", to: "accepted", role, canEdit: false }).ok).toBe(false);
    }
  });

  it("sends a failure back to the queue with a reprint counted, and records both steps", () => {
    const r = planTransition({ from: "printing", to: "failed", role: "operator", canEdit: false, reason: "spaghetti at layer 40" });
    expect(r).toEqual({ ok: true, steps: [{ from: "printing", to: "failed" }, { from: "failed", to: "queued" }], final: "queued", reprint: true });
  });

  it("asks for a reason for failures and cancels only", () => {
    expect(planTransition({ from: "printing", to: "failed", role: "operator", canEdit: false, reason: " " }).ok).toBe(false);
    expect(planTransition({ from: "plated", to: "queued", role: "operator", canEdit: false }).ok).toBe(false);
    expect(needsReason("ready", "queued")).toBe(false);
    expect(planTransition({ from: "ready", to: "queued", role: "member", canEdit: true }).ok).toBe(true);
  });

  it("never offers a move the server would refuse", () => {
    for (const role of ["member", "operator", "admin"] as const) for (const from of partStatuses) {
      for (const to of allowedTargets(from, role, true)) expect(planTransition({ from, to, role, canEdit: true, reason: "why" }).ok).toBe(true);
    }
    expect(allowedTargets("queued", "member", true)).toEqual([]);
  });

  it("counts copies by status", () => {
    const c = countStatuses(["queued", "queued", "accepted"]);
    expect([c.queued, c.accepted, c.drafted]).toEqual([2, 1, 0]);
  });
});

describe("fitPrinters", () => {
  const beds = [
    { id: 1, name: "Small", bedX: 180, bedY: 180, height: 180, materials: ["PLA", "PETG"] },
    { id: 2, name: "Long", bedX: 300, bedY: 200, height: 250, materials: [] },
  ];
  it("turns the footprint 90° on the bed and checks height and material (worked by hand)", () => {
    // 250 × 150 × 100: too long for 180 × 180; on 300 × 200 it fits as is.
    expect(fitPrinters([250, 150, 100], "PLA", beds).map((f) => f.fits)).toEqual([false, true]);
    // 150 × 250 only fits the long bed when turned: 250 ≤ 300 and 150 ≤ 200.
    expect(fitPrinters([150, 250, 100], "PLA", beds)[1]?.fits).toBe(true);
    // 190 tall is over the small printer's 180 mm.
    expect(fitPrinters([50, 50, 190], "PLA", beds)[0]?.reason).toMatch(/height 190\.0 mm/);
    // ABS is not on the small printer's list; a printer with no list takes anything.
    expect(fitPrinters([50, 50, 50], "ABS", beds).map((f) => f.fits)).toEqual([false, true]);
    expect(fitPrinters([50, 50, 50], "pla", beds)[0]?.fits).toBe(true);
  });
});
