"use client";
// "Plan orientation": the search runs in the worker with progress and cancel; the best few are
// shown side by side in 3D with their overhangs shaded, each with its figures and "Use this".
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useRef, useState } from "react";
import { Button } from "@/components/ui/button";
import { EmptyState, Notice } from "@/components/ui/notice";
import { Viewer } from "@/components/viewer/viewer";
import type { CandidateView, OrientJobResult } from "@/lib/orient/worker-protocol";
import { queryKeys } from "@/lib/queries/keys";
import { pickOrientation } from "@/lib/queries/orientation";
import { downDetail } from "@/lib/rules/orientation-names";
import { downLabel, fileBytes, mm, plannerPrinters, type BedInfo } from "./format";
import { PlannerCancelled, useOrientWorker } from "./use-orient-worker";

const NO_EDGES = new Float32Array();

export interface PlannerPart {
  partId: number;
  fileId: number;
  units: "mm" | "in";
  layerHeight: number;
  material: string;
  beds: BedInfo[];
}

export function Progress({ fraction, label, onCancel }: { fraction: number; label: string; onCancel: () => void }) {
  const pct = Math.round(fraction * 100);
  return (
    <div className="flex items-center gap-3">
      <div role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={pct} className="h-2 flex-1 overflow-hidden rounded-full bg-rule/60">
        <div className="h-full bg-accent transition-[width]" style={{ width: `${pct}%` }} />
      </div>
      <span className="num min-w-10 text-xs text-ink-soft">{pct} %</span>
      <Button type="button" variant="secondary" onClick={onCancel}>Cancel</Button>
    </div>
  );
}

function Figures({ c, beds }: { c: CandidateView; beds: BedInfo[] }) {
  const fitting = c.fits.filter((f) => f.fits).map((f) => beds.find((b) => String(b.id) === f.printerId)?.name ?? f.printerId);
  return (
    <dl className="grid grid-cols-[auto_1fr] gap-x-2 text-xs">
      <dt className="text-ink-soft">Overhang</dt><dd className="num">{mm(c.overhangArea, 0)} mm²</dd>
      <dt className="text-ink-soft">Support</dt><dd className="num">{mm(c.supportVolume, 0)} mm³</dd>
      <dt className="text-ink-soft">Height</dt><dd className="num">{mm(c.height)} mm, {c.layers} layers</dd>
      <dt className="text-ink-soft">On the bed</dt><dd className="num">{mm(c.bedContactArea, 0)} mm²</dd>
      <dt className="text-ink-soft">Fits</dt><dd>{beds.length === 0 ? "no printers set up" : fitting.length ? fitting.join(", ") : "no printer"}</dd>
    </dl>
  );
}

function CandidateCard({ c, title, busy, onUse, beds }: { c: CandidateView; title: string; busy: boolean; onUse: () => void; beds: BedInfo[] }) {
  return (
    <li className="flex flex-col gap-2 rounded-lg border border-rule bg-sheet p-2" aria-label={title}>
      <div className="h-40 overflow-hidden rounded border border-rule">
        <Viewer positions={c.positions} overhangMask={c.overhangMask} bed={null} edges={NO_EDGES} showProblems={false} />
      </div>
      <h4 className="text-sm font-semibold">{title}: {c.label}</h4>
      <p className="text-xs text-ink-soft">{c.label.toLowerCase() === c.turn ? downDetail(c.down) : downLabel(c.down)}</p>
      {c.stable ? null : (
        <p className="text-xs text-fail" role="note">
          ⚠ Not printable as it stands: {c.bedContactArea < c.contactRequired ? `${mm(c.bedContactArea, 0)} mm² on the bed, at least ${mm(c.contactRequired, 0)} mm² needed` : "its centre of mass is not over the face it rests on, so it would tip"}.
        </p>
      )}
      <Figures c={c} beds={beds} />
      <Button type="button" variant={title.startsWith("Best") ? "primary" : "secondary"} disabled={busy || (!c.stable && !title.startsWith("File"))} onClick={onUse}>
        {c.source === "original" && title.startsWith("File") ? "Keep the file's own" : "Use this"}
      </Button>
    </li>
  );
}

export function OrientationPanel({ p }: { p: PlannerPart }) {
  const { orient } = useOrientWorker();
  const router = useRouter();
  const qc = useQueryClient();
  const [fraction, setFraction] = useState<number | null>(null);
  const [result, setResult] = useState<OrientJobResult | null>(null);
  const [error, setError] = useState<string | null>(null);
  const cancelRef = useRef<() => void>(() => {});
  const use = useMutation({
    mutationFn: (c: CandidateView | "original") => pickOrientation(p.partId, c === "original" ? { kind: "original", fileId: p.fileId } : { kind: "rotation", fileId: p.fileId, quaternion: c.rotation.quaternion }),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.orientation.all }), qc.invalidateQueries({ queryKey: queryKeys.parts.all })]),
    // The quote on the page is rendered by the server from the stored orientation: fetch it again.
    onSuccess: () => router.refresh(),
  });

  const run = async () => {
    setError(null);
    setResult(null);
    setFraction(0);
    try {
      const buf = await fileBytes(p.fileId);
      const call = orient(buf, { units: p.units, printers: plannerPrinters(p.beds, p.material), layerHeight: p.layerHeight }, setFraction);
      cancelRef.current = call.cancel;
      setResult(await call.promise);
    } catch (e) {
      if (!(e instanceof PlannerCancelled)) setError(e instanceof Error ? e.message : "The search failed.");
    } finally {
      setFraction(null);
    }
  };

  return (
    <section aria-labelledby="orient-h" className="flex flex-col gap-3">
      <h2 id="orient-h">Plan orientation</h2>
      <p className="text-sm text-ink-soft">Tries some 280 ways to stand the part on the bed and offers only those resting on a real face (at least 25 mm², or half the part&apos;s largest when it is small) with the centre of mass over it, ranked by least support, then overhang, height and contact. Violet faces need support.</p>
      {fraction === null ? (
        <div><Button type="button" onClick={run}>{result ? "Search again" : "Find orientations"}</Button></div>
      ) : (
        <Progress fraction={fraction} label="Orientation search" onCancel={() => { cancelRef.current(); setFraction(null); }} />
      )}
      {error ? <Notice tone="fail" title="The orientation search failed.">{error}</Notice> : null}
      {use.isError ? <Notice tone="fail" title="The orientation could not be saved.">{use.error.message}</Notice> : null}
      {use.isSuccess ? <Notice tone="ok" title="Orientation saved. The 3D view, figures, fit, quote and packing use it from now on." /> : null}
      {result && result.candidates.length === 0 ? <EmptyState title="No orientation stands by itself">No way of laying this part rests on a face of the needed size with its centre of mass over it. Keep the file&apos;s own and ask the workshop about a brim or supports.</EmptyState> : null}
      {result ? (
        <ol aria-label="Ranked orientations" className="grid gap-3 sm:grid-cols-2 xl:grid-cols-3">
          {result.candidates.map((c, i) => (
            <CandidateCard key={i} c={c} beds={p.beds} busy={use.isPending} title={i === 0 ? "Best" : `Choice ${i + 1}`} onUse={() => use.mutate(c)} />
          ))}
          <CandidateCard c={result.original} beds={p.beds} busy={use.isPending} title="File's own orientation" onUse={() => use.mutate("original")} />
        </ol>
      ) : null}
    </section>
  );
}
