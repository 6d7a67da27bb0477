// Part and item status rules: which moves exist and who may make them. Framework-free, so the
// server enforces exactly what the page offers.

export const partStatuses = ["drafted", "ready", "queued", "plated", "printing", "printed", "accepted", "failed"] as const;
export type PartStatus = (typeof partStatuses)[number];

export const itemStatuses = ["to_order", "ordered", "in_hand"] as const;
export type ItemStatus = (typeof itemStatuses)[number];

export type StatusRole = "member" | "operator" | "admin";

export const partStatusLabel: Record<PartStatus, string> = {
  drafted: "Drafted",
  ready: "Ready",
  queued: "Queued",
  plated: "Plated",
  printing: "Printing",
  printed: "Printed",
  accepted: "Accepted",
  failed: "Failed",
};

export const partStatusHint: Record<PartStatus, string> = {
  drafted: "Still being prepared by its owner.",
  ready: "The owner says it is ready to print.",
  queued: "Waiting in the workshop for a plate.",
  plated: "Placed on a build plate for a printer.",
  printing: "On a printer now.",
  printed: "Off the printer; waiting for the owner to check it.",
  accepted: "Checked and kept by the owner.",
  failed: "The print failed; it goes back to the queue.",
};

export const itemStatusLabel: Record<ItemStatus, string> = { to_order: "To order", ordered: "Ordered", in_hand: "In hand" };

/** Moves a member who may edit the part can make. */
const memberMoves: [PartStatus, PartStatus][] = [
  ["drafted", "ready"],
  ["ready", "drafted"],
  // Sending to the workshop will gain its own step later; for now the member queues directly.
  ["ready", "queued"],
  ["printed", "accepted"],
];

/** Moves the workshop makes (operators and admins). */
const workshopMoves: [PartStatus, PartStatus][] = [
  ["queued", "plated"],
  ["plated", "printing"],
  ["printing", "printed"],
  ["printing", "failed"],
];

/** A cancel sends a part that is already in the workshop's hands back to the queue. */
const cancellable: PartStatus[] = ["plated", "printing", "printed", "accepted"];

export interface TransitionRequest {
  from: PartStatus;
  to: PartStatus;
  role: StatusRole;
  /** The member owns the part's assembly or has an edit share on it. */
  canEdit: boolean;
  reason?: string;
}

export interface StatusStep {
  from: PartStatus;
  to: PartStatus;
}

export type TransitionResult =
  | { ok: true; steps: StatusStep[]; final: PartStatus; reprint: boolean }
  | { ok: false; message: string };

function has(list: [PartStatus, PartStatus][], from: PartStatus, to: PartStatus): boolean {
  return list.some(([a, b]) => a === from && b === to);
}

/** Targets this person may pick from a status, in display order. */
export function allowedTargets(from: PartStatus, role: StatusRole, canEdit: boolean): PartStatus[] {
  return partStatuses.filter((to) => planTransition({ from, to, role, canEdit, reason: "x" }).ok);
}

/** Whether a move needs a written reason (failures and cancels do, so the history explains them). */
export function needsReason(from: PartStatus, to: PartStatus): boolean {
  return to === "failed" || (to === "queued" && cancellable.includes(from));
}

/**
 * Checks one requested move. A failure is recorded and then, in the same change, the instance
 * goes back to the queue with one more reprint counted.
 */
export function planTransition(req: TransitionRequest): TransitionResult {
  const { from, to, role } = req;
  if (from === to) return { ok: false, message: `The part is already ${partStatusLabel[to].toLowerCase()}.` };
  const workshop = role === "operator" || role === "admin";
  let allowed = false;
  if (role === "member") allowed = req.canEdit && has(memberMoves, from, to);
  if (workshop) allowed = has(workshopMoves, from, to) || (to === "queued" && cancellable.includes(from));
  if (!allowed) {
    const who = role === "member" ? (req.canEdit ? "You" : "Only the owner or someone the assembly is shared with for editing") : "The workshop";
    return { ok: false, message: `${who} cannot move a part from ${partStatusLabel[from].toLowerCase()} to ${partStatusLabel[to].toLowerCase()}.` };
  }
  if (needsReason(from, to) && !req.reason?.trim()) {
    return { ok: false, message: to === "failed" ? "Say what went wrong with the print." : "Say why the part goes back to the queue." };
  }
  if (to === "failed") {
    return { ok: true, steps: [{ from, to: "failed" }, { from: "failed", to: "queued" }], final: "queued", reprint: true };
  }
  return { ok: true, steps: [{ from, to }], final: to, reprint: false };
}

export type StatusCounts = Record<PartStatus, number>;

export function emptyCounts(): StatusCounts {
  return Object.fromEntries(partStatuses.map((s) => [s, 0])) as StatusCounts;
}

export function countStatuses(statuses: readonly PartStatus[]): StatusCounts {
  const c = emptyCounts();
  for (const s of statuses) c[s]++;
  return c;
}

/** Done means the owner accepted the copy; anything short of that is still needed. */
export function isDone(s: PartStatus): boolean {
  return s === "accepted";
}
