"use client";
// Whether the part's mesh is a closed solid: what is wrong in plain words, the automatic repair
// (as a new version, with the figures before and after) and the workshop's explicit acceptance.
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { sendJson } from "@/lib/queries/assemblies";
import { queryKeys } from "@/lib/queries/keys";
import type { PartDetailWire } from "@/lib/queries/parts";

type Health = NonNullable<PartDetailWire["health"]>;
type Snapshot = NonNullable<Health["repair"]>["before"];

const n = (x: number, d = 0) => x.toLocaleString("en-GB", { maximumFractionDigits: d, minimumFractionDigits: d });

function BeforeAfter({ before, after, fromVersion }: { before: Snapshot; after: Snapshot; fromVersion: number }) {
  const rows: [string, string, string][] = [
    ["Closed solid", before.watertight ? "yes" : "no", after.watertight ? "yes" : "no"],
    ["Volume", `${n(before.volumeMm3, 1)} mm³${before.volumeReliable ? "" : " (not reliable)"}`, `${n(after.volumeMm3, 1)} mm³${after.volumeReliable ? "" : " (not reliable)"}`],
    ["Open edges", n(before.openEdges), n(after.openEdges)],
    ["Flipped neighbours", n(before.flippedEdges), n(after.flippedEdges)],
    ["Edges of 3+ faces", n(before.sharedEdges), n(after.sharedEdges)],
    ["Faces with no area", n(before.zeroAreaFaces), n(after.zeroAreaFaces)],
    ["Triangles", n(before.triangles), n(after.triangles)],
  ];
  return (
    <table className="mt-2 w-full text-sm" aria-label="Mesh before and after the repair">
      <caption className="text-left text-xs text-ink-soft">Repaired from version {fromVersion}</caption>
      <thead>
        <tr className="text-left text-xs text-ink-soft">
          <th scope="col" className="py-1 pr-4 font-normal">Figure</th>
          <th scope="col" className="py-1 pr-4 text-right font-normal">Before</th>
          <th scope="col" className="py-1 text-right font-normal">After</th>
        </tr>
      </thead>
      <tbody>
        {rows.map(([label, b, a]) => (
          <tr key={label} className="border-t border-rule">
            <th scope="row" className="py-1 pr-4 text-left font-normal">{label}</th>
            <td className="num py-1 pr-4 text-right">{b}</td>
            <td className="num py-1 text-right">{a}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

function AcceptForm({ partId, fileId }: { partId: number; fileId: number }) {
  const qc = useQueryClient();
  const [note, setNote] = useState("");
  const accept = useMutation({
    mutationFn: () => sendJson(`/api/parts/${partId}/accept-mesh`, "POST", { fileId, note }),
    onSettled: () => qc.invalidateQueries({ queryKey: queryKeys.parts.all }),
  });
  return (
    <form aria-label="Accept the mesh as it is" className="mt-3 flex flex-col gap-2" onSubmit={(e: FormEvent) => { e.preventDefault(); accept.mutate(); }}>
      <Field label="Why the workshop accepts it as it is" name="accept-note" errors={accept.isError ? [accept.error.message] : undefined}>
        <TextInput id="accept-note" name="note" value={note} onChange={(e) => setNote(e.target.value)} invalid={accept.isError} />
      </Field>
      <div><Button type="submit" variant="secondary" disabled={accept.isPending}>{accept.isPending ? "Saving…" : "Accept as it is"}</Button></div>
    </form>
  );
}

export function MeshHealthPanel({ d }: { d: PartDetailWire }) {
  const qc = useQueryClient();
  const h = d.health;
  const repair = useMutation({
    mutationFn: (fileId: number) => sendJson<{ sound: boolean; problemsLeft: { text: string }[] }>(`/api/parts/${d.part.id}/repair`, "POST", { fileId }),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.parts.all }), qc.invalidateQueries({ queryKey: queryKeys.orientation.all })]),
  });
  if (!h) return null;
  const workshop = d.access === "workshop";
  const canRepair = d.canEdit && !workshop && h.problems.some((p) => p.repairable);
  return (
    <section aria-labelledby="health-h" className="flex flex-col gap-2" data-testid="mesh-health">
      <h2 id="health-h" className="sr-only">Mesh health</h2>
      {h.sound ? (
        <p className="text-sm text-ink-soft">✓ The mesh is a closed solid: its volume, grams and price can be trusted.</p>
      ) : (
        <Notice tone={h.accepted ? "warn" : "fail"} title={h.accepted ? "The mesh is not a closed solid; the workshop accepted it as it is." : "The mesh is not a closed solid, so it cannot be sent to the workshop."}>
          <ul className="list-disc pl-5" aria-label="What is wrong with the mesh">
            {h.problems.map((p) => <li key={p.key}>{p.text}{p.repairable ? "" : " The automatic repair cannot fix this."}</li>)}
          </ul>
          {h.accepted ? <p className="mt-2">Accepted by {h.accepted.by}{h.accepted.at ? ` on ${new Date(h.accepted.at).toLocaleDateString("en-GB")}` : ""}: “{h.accepted.note}”</p> : null}
        </Notice>
      )}
      {canRepair ? (
        <div className="flex flex-wrap items-center gap-3">
          <Button type="button" disabled={repair.isPending} onClick={() => repair.mutate(h.fileId)}>{repair.isPending ? "Repairing…" : "Repair the mesh"}</Button>
          <span className="text-xs text-ink-soft">Flips inconsistent faces, closes small holes, drops duplicate and zero-area faces; saved as a new version.</span>
        </div>
      ) : null}
      {repair.isError ? <Notice tone="fail" title="The mesh could not be repaired.">{repair.error.message}</Notice> : null}
      {repair.isSuccess ? (
        <Notice tone={repair.data.sound ? "ok" : "warn"} title={repair.data.sound ? "Repaired: the new version is a closed solid." : "Repaired what could be repaired; some problems remain."}>
          {repair.data.problemsLeft.map((p) => <p key={p.text}>{p.text}</p>)}
        </Notice>
      ) : null}
      {h.repair ? <BeforeAfter before={h.repair.before} after={h.repair.after} fromVersion={h.repair.fromVersion} /> : null}
      {workshop && !h.sound && !h.accepted ? <AcceptForm partId={d.part.id} fileId={h.fileId} /> : null}
    </section>
  );
}
