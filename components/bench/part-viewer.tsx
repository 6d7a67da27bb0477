"use client";
// The part in 3D as it will print (its chosen orientation, overhangs shaded for that orientation),
// with a toggle to see the file as drawn; and the figures of the part as it will print.
import { useQuery } from "@tanstack/react-query";
import { useEffect, useMemo, useState } from "react";
import { useMeshWorker } from "@/components/mesh/use-mesh-worker";
import { downLabel, mm } from "@/components/orient/format";
import { EmptyState, Notice } from "@/components/ui/notice";
import { problemEdges } from "@/components/viewer/problem-edges";
import { Viewer } from "@/components/viewer/viewer";
import type { AnalysisJson } from "@/lib/mesh/json";
import type { ViewerArrays } from "@/lib/mesh/worker-protocol";
import { applyOrientation, matrixFromQuaternion, rotationFromMatrix } from "@/lib/orient";
import { overhangMaskFor } from "@/lib/orient/worker-protocol";
import { orientationQuery } from "@/lib/queries/orientation";
import type { PartDetailWire } from "@/lib/queries/parts";

/** Fetches the stored mesh and reads it in the worker, so the page's thread never parses. */
function useStoredMesh(fileId: number | null, units: "mm" | "in") {
  const { analyze } = useMeshWorker();
  const [state, setState] = useState<{ id: number; arrays?: ViewerArrays; error?: string } | null>(null);
  useEffect(() => {
    if (fileId === null) return;
    let cancel = () => {};
    let stop = false;
    fetch(`/api/files/${fileId}`)
      .then((r) => (r.ok ? r.arrayBuffer() : Promise.reject(new Error(`the file could not be fetched (${r.status})`))))
      .then((buf) => {
        if (stop) return;
        const call = analyze(buf, { units });
        cancel = call.cancel;
        return call.promise.then((res) => !stop && setState({ id: fileId, arrays: res.arrays }));
      })
      .catch((e: Error) => !stop && setState({ id: fileId, error: e.message }));
    return () => {
      stop = true;
      cancel();
    };
  }, [fileId, units, analyze]);
  return state && state.id === fileId ? state : null;
}

/** The chosen orientation for the current file (null: the file's own). */
function useChosen(partId: number, fileId: number | null) {
  const o = useQuery(orientationQuery(partId));
  const c = o.data?.chosen;
  return c && c.fileId === fileId && c.summary.source !== "original" ? c : null;
}

export function ViewerPanel({ d }: { d: PartDetailWire }) {
  const cur = d.current;
  const mesh = useStoredMesh(cur?.id ?? null, (cur?.units ?? "mm") as "mm" | "in");
  const chosen = useChosen(d.part.id, cur?.id ?? null);
  const [asDrawn, setAsDrawn] = useState(false);
  const [showProblems, setShowProblems] = useState(false);
  const fitting = d.fit.fits.filter((f) => f.fits);
  const [bedId, setBedId] = useState<number | null>(null);
  const beds = d.fit.fits;
  const arrays = mesh?.arrays;
  const overhangDeg = (cur?.analysis as AnalysisJson | undefined)?.overhang_deg ?? 45;
  const quaternion = chosen ? chosen.quaternion.join(",") : null;
  // As it will print: the mesh turned by the chosen rotation, overhangs judged in that orientation.
  const view = useMemo(() => {
    if (!arrays) return null;
    if (!quaternion || asDrawn) return { positions: arrays.positions, mask: arrays.overhangMask, edges: problemEdges(arrays.positions) };
    const q = quaternion.split(",").map(Number) as [number, number, number, number];
    const r = rotationFromMatrix(matrixFromQuaternion(q));
    const turned = applyOrientation({ positions: arrays.positions }, r).positions;
    return { positions: turned, mask: overhangMaskFor(turned, overhangDeg), edges: problemEdges(turned) };
  }, [arrays, quaternion, asDrawn, overhangDeg]);
  if (!cur) return <EmptyState title="No mesh yet">Upload an STL or 3MF below to see the part in 3D.</EmptyState>;
  const bedPick = beds.find((b) => b.printerId === bedId) ?? fitting[0] ?? beds[0];
  const bed = bedPick ? (d.beds.find((b) => b.id === bedPick.printerId) ?? null) : null;
  const printing = !!chosen && !asDrawn;
  return (
    <div className="flex flex-col gap-2">
      <div className="h-[26rem] overflow-hidden rounded-lg border border-rule" data-testid="part-viewer" data-view={printing ? "as-printed" : "as-drawn"}>
        {view ? (
          <Viewer positions={view.positions} overhangMask={view.mask} bed={bed ? { x: bed.bedX, y: bed.bedY, name: bed.name } : null} edges={view.edges} showProblems={showProblems} />
        ) : mesh?.error ? (
          <Notice tone="fail" title="The 3D view could not be shown.">{mesh.error}</Notice>
        ) : (
          <div role="status" className="flex h-full items-center justify-center text-sm text-ink-soft">Reading the mesh…</div>
        )}
      </div>
      <p className="text-xs text-ink-soft" data-testid="viewer-caption">
        {printing ? `As it will print: ${chosen.summary.label ?? downLabel(chosen.down)}.` : chosen ? "As drawn in the file (it will print turned: untick to see it)." : "As drawn in the file; it prints this way up."}
      </p>
      <div className="flex flex-wrap items-center gap-4 text-xs text-ink-soft">
        <span><span aria-hidden className="mr-1 inline-block h-3 w-3 rounded-sm bg-clay align-middle" />Part</span>
        <span><span aria-hidden className="mr-1 inline-block h-3 w-3 rounded-sm bg-overhang align-middle" />Overhang past {overhangDeg}°</span>
        <span><span aria-hidden className="mr-1 inline-block h-3 w-3 rounded-sm bg-[#b9b6ae] align-middle" />Bed{bed ? ` of ${bed.name}, ${bed.bedX} × ${bed.bedY} mm, 10 mm grid` : " (no printer yet: a stand-in)"}</span>
        {chosen ? (
          <label className="flex items-center gap-1">
            <input type="checkbox" checked={asDrawn} onChange={(e) => setAsDrawn(e.target.checked)} />
            Show as drawn
          </label>
        ) : null}
        <label className="flex items-center gap-1">
          <input type="checkbox" checked={showProblems} onChange={(e) => setShowProblems(e.target.checked)} />
          <span><span aria-hidden className="mr-1 inline-block h-0.5 w-4 bg-[#e0b400] align-middle" />Show open and non-manifold edges ({(view?.edges.length ?? 0) / 6})</span>
        </label>
        {beds.length > 1 ? (
          <label className="flex items-center gap-1">
            Bed
            <select aria-label="Bed to draw" className="rounded border border-rule bg-sheet px-1" value={bedPick?.printerId} onChange={(e) => setBedId(Number(e.target.value))}>
              {beds.map((b) => <option key={b.printerId} value={b.printerId}>{b.name}</option>)}
            </select>
          </label>
        ) : null}
      </div>
    </div>
  );
}

/** The part as it will print: the chosen orientation's figures, else the file's own. */
export function PrintedFigures({ d, a }: { d: PartDetailWire; a: AnalysisJson }) {
  const chosen = useChosen(d.part.id, d.current?.id ?? null);
  const s = chosen?.summary;
  const rows: [string, string, string][] = s
    ? [
        ["orientation", "Orientation", s.label ?? downLabel(chosen.down)],
        ["bed_size", "On the bed", `${mm(s.footprint[0] ?? 0)} × ${mm(s.footprint[1] ?? 0)} mm, ${mm(s.height)} mm high (${s.layers} layers)`],
        ["overhang", `Overhang past ${a.overhang_deg}°`, s.overhangArea === undefined ? "not measured" : `${mm(s.overhangArea, 0)} mm²`],
        ["contact", "Resting on", s.bedContactArea === undefined ? "not measured" : `${mm(s.bedContactArea, 0)} mm²`],
        ["support", "Support to fill", s.supportVolume === undefined ? "not measured" : `about ${mm(s.supportVolume, 0)} mm³`],
      ]
    : [
        ["orientation", "Orientation", "as drawn in the file"],
        ["bed_size", "On the bed", `${mm(a.size[0])} × ${mm(a.size[1])} mm, ${mm(a.size[2])} mm high`],
        ["overhang", `Overhang past ${a.overhang_deg}°`, `${mm(a.overhang_area_mm2, 0)} mm²`],
        ["contact", "Resting on", `${mm(a.bed_contact_area_mm2, 0)} mm²`],
      ];
  return (
    <>
      <h3 className="text-sm font-semibold">As it will print</h3>
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm" aria-label="Figures as it will print" data-testid="printed-figures">
        {rows.map(([k, label, text]) => (
          <div key={k} className="contents" data-key={k}>
            <dt className="text-ink-soft">{label}</dt>
            <dd className="num">{text}</dd>
          </div>
        ))}
      </dl>
      {s && s.stable === false ? <Notice tone="warn" title="This orientation may not stand by itself on the bed." /> : null}
    </>
  );
}
