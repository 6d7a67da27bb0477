"use client";
// "Plan a split": the planner ranks cuts in the worker; the member previews one (pieces drawn
// apart) and accepts it. The server re-cuts the stored mesh itself and creates the pieces as parts.
import { useMutation, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useMemo, useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { EmptyState, Notice } from "@/components/ui/notice";
import { Viewer } from "@/components/viewer/viewer";
import type { Quat } from "@/lib/orient/rotation";
import type { SplitCandidateView, SplitJobResult } from "@/lib/orient/worker-protocol";
import { queryKeys } from "@/lib/queries/keys";
import { acceptSplitCall } from "@/lib/queries/orientation";
import { DEFAULT_PEG_CLEARANCE_MM, PEG_DEPTH_MM, PEG_DIAMETER_MM } from "@/lib/orient/pegs";
import { splitSaving, SPLIT_MIN_SAVED_MM3, SPLIT_MIN_SAVED_SHARE } from "@/lib/rules/split";
import { fileBytes, mm, plannerPrinters } from "./format";
import { Progress, type PlannerPart } from "./orientation-panel";
import { PlannerCancelled, useOrientWorker } from "./use-orient-worker";

const NO_EDGES = new Float32Array();
/** Gap between pieces in the preview, mm. */
const GAP = 8;

function centroid(p: Float32Array): [number, number, number] {
  const c: [number, number, number] = [0, 0, 0];
  const n = p.length / 3 || 1;
  for (let i = 0; i < p.length; i += 3) { c[0] += p[i]!; c[1] += p[i + 1]!; c[2] += p[i + 2]!; }
  return [c[0] / n, c[1] / n, c[2] / n];
}

/** Pieces moved apart from the whole's centre, so the cut shows; plain clay (no overhang shading). */
function exploded(c: SplitCandidateView): { positions: Float32Array; mask: Uint8Array } {
  const total = c.pieces.reduce((s, p) => s + p.positions.length, 0);
  const out = new Float32Array(total);
  const all: [number, number, number] = [0, 0, 0];
  for (const p of c.pieces) {
    const pc = centroid(p.positions);
    for (let k = 0; k < 3; k++) all[k] = all[k]! + (pc[k]! * p.positions.length) / (total || 1);
  }
  let at = 0;
  for (const p of c.pieces) {
    const pc = centroid(p.positions);
    const d = [pc[0] - all[0], pc[1] - all[1], pc[2] - all[2]];
    const l = Math.hypot(d[0]!, d[1]!, d[2]!) || 1;
    for (let i = 0; i < p.positions.length; i++) out[at + i] = p.positions[i]! + (d[i % 3]! / l) * GAP;
    at += p.positions.length;
  }
  return { positions: out, mask: new Uint8Array(total / 9) };
}

function Preview({ c }: { c: SplitCandidateView }) {
  const view = useMemo(() => exploded(c), [c]);
  return (
    <div className="h-56 overflow-hidden rounded border border-rule" data-testid="split-preview">
      <Viewer positions={view.positions} overhangMask={view.mask} bed={null} edges={NO_EDGES} showProblems={false} />
    </div>
  );
}

/** One ranked cut. Before, after, saving and share come from the same two rounded figures, so they add up as shown. */
function SplitRow({ c, i, picked, onPick }: { c: SplitCandidateView; i: number; picked: boolean; onPick: () => void }) {
  const before = Math.round(c.supportBefore), after = Math.round(c.supportAfter);
  const { saved, share } = splitSaving({ supportBefore: before, supportAfter: after });
  return (
    <tr className={`border-t border-rule ${picked ? "bg-accent-wash" : ""}`}>
      <td className="px-2 py-1"><label className="flex items-center gap-1"><input type="radio" name="split-pick" checked={picked} onChange={onPick} aria-label={`Split ${i + 1}`} />{i === 0 ? "Best" : `#${i + 1}`}</label></td>
      <td className="num px-2 py-1 text-right">{c.pieces.length}</td>
      <td className="num px-2 py-1 text-right">{mm(before, 0)} → {mm(after, 0)} mm³</td>
      <td className="num px-2 py-1 text-right">{mm(saved, 0)} mm³ ({Math.round(100 * share)} %)</td>
      <td className="num px-2 py-1 text-right">{mm(c.cutArea, 0)} mm²</td>
      <td className="px-2 py-1">{c.allPiecesFit ? "✓ yes" : "✕ no"}</td>
    </tr>
  );
}

export function SplitPanel({ p, quaternion }: { p: PlannerPart; quaternion: Quat }) {
  const { split } = useOrientWorker();
  const qc = useQueryClient();
  const [fraction, setFraction] = useState<number | null>(null);
  const [plan, setPlan] = useState<SplitJobResult | null>(null);
  const [pick, setPick] = useState(0);
  const [error, setError] = useState<string | null>(null);
  const [pegs, setPegs] = useState(true);
  const [clearance, setClearance] = useState(String(DEFAULT_PEG_CLEARANCE_MM));
  const cancelRef = useRef<() => void>(() => {});
  const accept = useMutation({
    mutationFn: (c: SplitCandidateView) =>
      acceptSplitCall(p.partId, {
        fileId: p.fileId,
        quaternion,
        cut: c.kind === "plane" && c.planes[0] ? { kind: "plane", plane: { normal: c.planes[0].normal, offset: c.planes[0].offset } } : { kind: "to-fit" },
        ...(pegs && c.kind === "plane" ? { pegs: { clearanceMm: Number(clearance) } } : {}),
      }),
    onSuccess: () => setPlan(null),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.orientation.all }), qc.invalidateQueries({ queryKey: queryKeys.parts.all }), qc.invalidateQueries({ queryKey: queryKeys.assemblies.all })]),
  });

  const run = async () => {
    setError(null);
    setPlan(null);
    setPick(0);
    setFraction(0);
    try {
      const buf = await fileBytes(p.fileId);
      const call = split(buf, { units: p.units, printers: plannerPrinters(p.beds, p.material), layerHeight: p.layerHeight, quaternion }, setFraction);
      cancelRef.current = call.cancel;
      setPlan(await call.promise);
    } catch (e) {
      if (!(e instanceof PlannerCancelled)) setError(e instanceof Error ? e.message : "The split planner failed.");
    } finally {
      setFraction(null);
    }
  };

  const chosen = plan?.candidates[pick];
  return (
    <section aria-labelledby="split-h" className="flex flex-col gap-3">
      <h2 id="split-h">Plan a split</h2>
      <p className="text-sm text-ink-soft">Looks for cuts that save support or make a part too big for every printer printable, in the orientation above. Accepting a cut makes each piece a new part to glue.</p>
      {fraction === null ? (
        <div><Button type="button" variant="secondary" onClick={run}>{plan ? "Plan again" : "Plan a split"}</Button></div>
      ) : (
        <Progress fraction={fraction} label="Split planner" onCancel={() => { cancelRef.current(); setFraction(null); }} />
      )}
      {error ? <Notice tone="fail" title="The split planner failed.">{error}</Notice> : null}
      {accept.isError ? <Notice tone="fail" title="The split could not be made.">{accept.error.message}</Notice> : null}
      {accept.isSuccess ? (
        <Notice tone="ok" title={`Split into ${accept.data.pieces.length} pieces.`}>
          <ul>{accept.data.pieces.map((x) => <li key={x.partId}><Link className="underline" href={`/bench/parts/${x.partId}`}>{x.name}</Link></li>)}</ul>
        </Notice>
      ) : null}
      {plan && plan.candidates.length === 0 ? <EmptyState title="No cut worth making">No plane saves at least {SPLIT_MIN_SAVED_MM3} mm³ and {Math.round(SPLIT_MIN_SAVED_SHARE * 100)} % of the support{plan.partFits ? ", and the part already fits a printer" : " or makes the part fit a printer"}.</EmptyState> : null}
      {plan && plan.candidates.length > 0 ? (
        <>
          <table className="w-full text-sm" aria-label="Ranked splits">
            <thead>
              <tr className="text-left text-xs text-ink-soft">
                <th scope="col" className="px-2 py-1 font-normal">Preview</th>
                <th scope="col" className="px-2 py-1 text-right font-normal">Pieces</th>
                <th scope="col" className="px-2 py-1 text-right font-normal">Support before → after</th>
                <th scope="col" className="px-2 py-1 text-right font-normal">Saved</th>
                <th scope="col" className="px-2 py-1 text-right font-normal">Glue face</th>
                <th scope="col" className="px-2 py-1 font-normal">All pieces fit</th>
              </tr>
            </thead>
            <tbody>
              {plan.candidates.map((c, i) => (
                <SplitRow key={i} c={c} i={i} picked={i === pick} onPick={() => setPick(i)} />
              ))}
            </tbody>
          </table>
          {chosen ? <Preview c={chosen} /> : null}
          {chosen?.kind === "plane" ? (
            <fieldset className="flex flex-wrap items-center gap-3 text-sm">
              <legend className="sr-only">Registration pegs</legend>
              <label className="flex items-center gap-1">
                <input type="checkbox" checked={pegs} onChange={(e) => setPegs(e.target.checked)} />
                Add registration pegs and matching holes on the cut face
              </label>
              <label className="flex items-center gap-1">
                Clearance
                <input type="number" step="0.05" min="0" max="1" className="w-16 rounded border border-rule bg-sheet px-1 text-right" value={clearance} onChange={(e) => setClearance(e.target.value)} disabled={!pegs} aria-describedby="peg-hint" />
                mm
              </label>
              <span id="peg-hint" className="text-xs text-ink-soft">{PEG_DIAMETER_MM} mm pegs, {PEG_DEPTH_MM} mm into each piece; the holes are wider and deeper by the clearance ({DEFAULT_PEG_CLEARANCE_MM} mm suits most printers).</span>
            </fieldset>
          ) : null}
          {chosen ? (
            <div className="flex items-center gap-3">
              <Button type="button" disabled={accept.isPending} onClick={() => accept.mutate(chosen)}>{accept.isPending ? "Cutting on the server…" : "Accept split"}</Button>
              <span className="text-xs text-ink-soft">Pieces of {chosen.pieces.map((x) => `${mm(x.volume / 1000)} cm³`).join(", ")}</span>
            </div>
          ) : null}
        </>
      ) : null}
    </section>
  );
}
