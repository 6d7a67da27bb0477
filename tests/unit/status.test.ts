// Part status rules, checked against the workflow written in issue 4 ("Decisions already made"),
// (the printer-fit rule is tested in tests/unit/rules/fit.test.ts).
import { describe, expect, it } from "vitest";
import { allowedTargets, countStatuses, needsReason, partStatuses, planTransition, type PartStatus } from "@/lib/status";

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
