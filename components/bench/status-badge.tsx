import { itemStatusLabel, partStatusHint, partStatusLabel, type ItemStatus, type PartStatus } from "@/lib/status";

const partTone: Record<PartStatus, string> = {
  drafted: "border-rule bg-sheet text-ink-soft",
  ready: "border-accent/30 bg-accent-wash text-accent-ink",
  queued: "border-ink/20 bg-paper text-ink",
  plated: "border-ink/20 bg-paper text-ink",
  printing: "border-warn/40 bg-warn-wash text-ink",
  printed: "border-accent/30 bg-accent-wash text-accent-ink",
  accepted: "border-accent bg-accent text-white",
  failed: "border-fail/40 bg-fail-wash text-fail",
};

export function PartStatusBadge({ status, count }: { status: PartStatus; count?: number }) {
  return (
    <span title={partStatusHint[status]} className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-medium ${partTone[status]}`}>
      {count !== undefined ? <span className="num">{count}×</span> : null}
      {partStatusLabel[status]}
    </span>
  );
}

const itemTone: Record<ItemStatus, string> = {
  to_order: "border-warn/40 bg-warn-wash text-ink",
  ordered: "border-ink/20 bg-paper text-ink",
  in_hand: "border-accent/30 bg-accent-wash text-accent-ink",
};

export function ItemStatusBadge({ status }: { status: ItemStatus }) {
  return <span className={`inline-flex rounded-full border px-2 py-0.5 text-xs font-medium ${itemTone[status]}`}>{itemStatusLabel[status]}</span>;
}

/** Counts of each status among a part's copies, in the order of the workflow. */
export function StatusSummary({ statuses }: { statuses: PartStatus[] }) {
  const counts = new Map<PartStatus, number>();
  for (const s of statuses) counts.set(s, (counts.get(s) ?? 0) + 1);
  const order = Object.keys(partStatusLabel) as PartStatus[];
  return (
    <span className="flex flex-wrap gap-1">
      {order.filter((s) => counts.has(s)).map((s) => (
        <PartStatusBadge key={s} status={s} count={counts.get(s)} />
      ))}
    </span>
  );
}
