// "All parts printed by …" for an assembly: the figure from lib/server/assembly-completion.ts, in the workshop's zone.
import { timeIn } from "@/components/floor/format";
import { Notice } from "@/components/ui/notice";
import { partStatusLabel } from "@/lib/status";
import type { AssemblyCompletion } from "@/lib/server/assembly-completion";

/** The sentence itself, shared by every place that shows the figure. */
export function completionSentence(c: AssemblyCompletion, timezone: string): string {
  if (c.copies === 0) return "No printed parts in this assembly yet.";
  if (c.printed === c.copies) return "All parts printed.";
  if (c.allPrintedBy === null) return "No copy is on a plate yet: the workshop plans them after they are sent.";
  const when = timeIn(c.allPrintedBy, timezone);
  return c.notPlanned.length === 0 ? `All parts printed by ${when}` : `Copies on plates printed by ${when}; ${c.notPlanned.length} not planned yet.`;
}

export function CompletionNote({ c, timezone }: { c: AssemblyCompletion; timezone: string }) {
  const shown = c.notPlanned.slice(0, 12);
  return (
    <Notice tone={c.notPlanned.length && c.printed < c.copies ? "warn" : "ok"} title={completionSentence(c, timezone)}>
      {c.printed < c.copies ? (
        <span data-testid="completion-detail">
          {c.printed} of {c.copies} copies printed, {c.onPlates} on plates (times in {timezone}, as planned now).
          {shown.length ? ` Not planned yet: ${shown.map((n) => `${n.partName} #${n.copyNo} (${partStatusLabel[n.status].toLowerCase()})`).join(", ")}${c.notPlanned.length > shown.length ? `, and ${c.notPlanned.length - shown.length} more` : ""}.` : ""}
        </span>
      ) : null}
    </Notice>
  );
}
