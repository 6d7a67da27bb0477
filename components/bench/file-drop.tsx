"use client";
// Drop or choose STL/3MF/STEP files: each is read at once in the mesh worker (numbers before anything
// is sent; a STEP file is tessellated there first), then sent with its own progress bar. STL has no
// units, so each row asks mm or inches; 3MF and STEP state their own.
import { useQueryClient } from "@tanstack/react-query";
import { useRef, useState, type DragEvent } from "react";
import { useMeshWorker } from "@/components/mesh/use-mesh-worker";
import { Button } from "@/components/ui/button";
import type { AnalysisJson } from "@/lib/mesh/json";
import { sendJson } from "@/lib/queries/assemblies";
import { queryKeys } from "@/lib/queries/keys";
import { uploadPartFile } from "@/lib/queries/parts";
import { Select } from "./form-bits";
import { ProgressBar } from "./progress-bar";

type Target = { kind: "new-parts"; assemblyId: number } | { kind: "version"; partId: number };

interface Row {
  key: number;
  file: File;
  units: "mm" | "in";
  phase: "reading" | "ready" | "uploading" | "analysing" | "done" | "failed";
  preview?: AnalysisJson;
  progress: number;
  /** While reading: "tessellate" when a STEP file is being turned into triangles. */
  reading?: string;
  error?: string;
  partId?: number;
}

/** Below this largest dimension a millimetre file is probably in inches (a part a few mm across). */
const INCH_HINT_MM = 8;

const isStl = (f: File) => /\.stl$/i.test(f.name);
const MESH_NAME = /\.(stl|3mf|step|stp)$/i;

export function FileDrop({ target }: { target: Target }) {
  const { analyze } = useMeshWorker();
  const qc = useQueryClient();
  const [rows, setRows] = useState<Row[]>([]);
  const [over, setOver] = useState(false);
  const nextKey = useRef(1);
  const input = useRef<HTMLInputElement>(null);
  const patch = (key: number, p: Partial<Row>) => setRows((rs) => rs.map((r) => (r.key === key ? { ...r, ...p } : r)));

  function add(files: FileList | File[]) {
    const list = [...files].slice(0, target.kind === "version" ? 1 : 50);
    const fresh: Row[] = list.map((file) => ({ key: nextKey.current++, file, units: "mm", phase: "reading", progress: 0 }));
    setRows((rs) => (target.kind === "version" ? fresh : [...rs, ...fresh]));
    for (const r of fresh) {
      if (!MESH_NAME.test(r.file.name)) {
        patch(r.key, { phase: "failed", error: "Only .stl, .3mf and .step (.stp) files can be uploaded." });
        continue;
      }
      analyze(r.file, { units: "mm" }, (phase) => patch(r.key, { reading: phase })).promise.then(
        (res) => patch(r.key, { phase: "ready", preview: res.json }),
        (e: Error) => patch(r.key, { phase: "failed", error: `${r.file.name} could not be read: ${e.message}.` }),
      );
    }
  }

  async function send(r: Row) {
    try {
      let partId = target.kind === "version" ? target.partId : r.partId;
      if (partId === undefined && target.kind === "new-parts") {
        const name = r.file.name.replace(MESH_NAME, "").replace(/[_-]+/g, " ").trim().slice(0, 120) || "Part";
        partId = (await sendJson<{ id: number }>(`/api/assemblies/${target.assemblyId}/parts`, "POST", { name, quantity: 1, material: "PLA" })).id;
        patch(r.key, { partId });
      }
      patch(r.key, { phase: "uploading", progress: 0, error: undefined });
      const call = uploadPartFile(partId!, r.file, r.units, (f) => patch(r.key, { progress: f, phase: f >= 1 ? "analysing" : "uploading" }));
      await call.promise;
      patch(r.key, { phase: "done", progress: 1 });
      await Promise.all([qc.invalidateQueries({ queryKey: queryKeys.assemblies.all }), qc.invalidateQueries({ queryKey: queryKeys.parts.all })]);
    } catch (e) {
      patch(r.key, { phase: "failed", error: (e as Error).message });
    }
  }

  const onDrop = (e: DragEvent) => {
    e.preventDefault();
    setOver(false);
    if (e.dataTransfer.files.length) add(e.dataTransfer.files);
  };
  const ready = rows.filter((r) => r.phase === "ready");

  return (
    <div className="flex flex-col gap-3">
      <div
        onDragOver={(e) => {
          e.preventDefault();
          setOver(true);
        }}
        onDragLeave={() => setOver(false)}
        onDrop={onDrop}
        className={`flex flex-col items-center gap-2 rounded-lg border-2 border-dashed px-4 py-6 text-center text-sm ${over ? "border-accent bg-accent-wash" : "border-rule bg-sheet/60"}`}
      >
        <p>{target.kind === "version" ? "Drop a new STL, 3MF or STEP file here to replace the mesh (the old one stays in the history)" : "Drop STL, 3MF or STEP files here: each becomes a part"}</p>
        <Button type="button" variant="secondary" onClick={() => input.current?.click()}>
          Choose files
        </Button>
        <input ref={input} type="file" aria-label="Mesh files" accept=".stl,.3mf,.step,.stp" multiple={target.kind !== "version"} className="sr-only" onChange={(e) => e.target.files && add(e.target.files)} />
      </div>
      {rows.length > 0 ? (
        <ul className="flex flex-col gap-2" aria-label="Files to upload">
          {rows.map((r) => {
            const s = r.preview ? r.preview.size.map((x) => x * (r.units === "in" ? 25.4 : 1)) : null;
            const smallHint = r.preview && isStl(r.file) && r.units === "mm" && Math.max(...r.preview.size) < INCH_HINT_MM;
            return (
              <li key={r.key} className="flex flex-col gap-2 rounded-md border border-rule bg-sheet px-3 py-2 text-sm" data-file={r.file.name}>
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <span className="font-medium">{r.file.name}</span>
                  <span className="num text-xs text-ink-soft">
                    {s ? `${s.map((x) => x.toFixed(1)).join(" × ")} mm · ${r.preview!.triangles} triangles` : r.phase === "reading" ? (r.reading === "tessellate" ? "Tessellating the STEP file…" : "Reading…") : ""}
                  </span>
                </div>
                {isStl(r.file) && (r.phase === "ready" || r.phase === "failed") && r.preview ? (
                  <label className="flex items-center gap-2 text-xs">
                    Units in this STL
                    <Select value={r.units} onChange={(e) => patch(r.key, { units: e.target.value as "mm" | "in" })} aria-label={`Units of ${r.file.name}`}>
                      <option value="mm">millimetres</option>
                      <option value="in">inches</option>
                    </Select>
                  </label>
                ) : null}
                {smallHint ? <p className="text-xs text-warn">⚠ Only {Math.max(...r.preview!.size).toFixed(2)} mm across: if it was drawn in inches, choose inches.</p> : null}
                {r.phase === "uploading" || r.phase === "analysing" || r.phase === "done" ? (
                  <ProgressBar value={Math.round(r.progress * 100)} max={100} label={`Upload of ${r.file.name}`} />
                ) : null}
                {r.phase === "analysing" ? <p className="text-xs text-ink-soft">Checking the file on the server…</p> : null}
                {r.phase === "done" ? <p className="text-xs text-accent-ink">✓ Uploaded and analysed.</p> : null}
                {r.error ? <p role="alert" className="text-xs text-fail">✕ {r.error}</p> : null}
                {r.phase === "ready" ? (
                  <div>
                    <Button type="button" onClick={() => send(r)}>
                      Upload {r.file.name}
                    </Button>
                  </div>
                ) : null}
              </li>
            );
          })}
        </ul>
      ) : null}
      {ready.length > 1 ? (
        <div>
          <Button type="button" onClick={() => ready.forEach((r) => void send(r))}>
            Upload all ({ready.length})
          </Button>
        </div>
      ) : null}
    </div>
  );
}
