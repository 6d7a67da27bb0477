"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { Notice } from "@/components/ui/notice";
import { PageHeader } from "@/components/ui/page-header";
import type { AnalysisJson } from "@/lib/mesh/json";
import { sendJson } from "@/lib/queries/assemblies";
import { fieldErrorsOf, formValues, TextArea } from "./form-bits";
import { queryKeys } from "@/lib/queries/keys";
import { partQuery, type PartDetailWire } from "@/lib/queries/parts";
import { FileDrop } from "./file-drop";
import { PrintedFigures, ViewerPanel } from "./part-viewer";
import { MeshHealthPanel } from "./mesh-health";
import { PartNumbers } from "./part-numbers";
import { PartStatusPanel } from "./part-status";
import { SendToWorkshop } from "@/components/plates/send-form";
import { splitLinksQuery } from "@/lib/queries/orientation";
import { LIVE_POLL_MS } from "@/lib/queries/queue";

function EditForm({ d }: { d: PartDetailWire }) {
  const qc = useQueryClient();
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const save = useMutation({
    mutationFn: (v: Record<string, string>) => sendJson(`/api/parts/${d.part.id}`, "PATCH", { ...v, version: d.part.version }),
    onSuccess: () => setErrors({}),
    onError: (e) => setErrors(fieldErrorsOf(e)),
    onSettled: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.parts.all }), qc.invalidateQueries({ queryKey: queryKeys.assemblies.all })]),
  });
  const p = d.part;
  const fields: [keyof typeof p, string, string?][] = [["name", "Name"], ["quantity", "Quantity needed", "number"], ["material", "Material"], ["colour", "Colour"], ["layerHeightMm", "Layer height (mm)", "number"], ["walls", "Walls", "number"], ["infillPercent", "Infill (%)", "number"]];
  return (
    <form key={p.version} noValidate aria-label="Part details" className="flex flex-col gap-3 rounded-lg border border-rule bg-sheet p-4" onSubmit={(e: FormEvent<HTMLFormElement>) => { e.preventDefault(); save.mutate(formValues(e.currentTarget)); }}>
      <h3 className="font-semibold">Part details</h3>
      {save.isError && !Object.keys(errors).length ? <Notice tone="fail" title={save.error.message} /> : null}
      {save.isSuccess ? <Notice tone="ok" title="Saved." /> : null}
      <div className="grid gap-3 sm:grid-cols-2">
        {fields.map(([k, label, type]) => (
          <Field key={k} label={label} name={`edit-${k}`} errors={errors[k]}>
            <TextInput id={`edit-${k}`} name={k} type={type ?? "text"} step={k === "layerHeightMm" ? "0.01" : undefined} defaultValue={String(p[k] ?? "")} invalid={!!errors[k]} disabled={!d.canEdit} />
          </Field>
        ))}
      </div>
      <Field label="Notes" name="edit-notes" errors={errors.notes}>
        <TextArea id="edit-notes" name="notes" defaultValue={p.notes} disabled={!d.canEdit} />
      </Field>
      {d.canEdit ? <div><Button type="submit" disabled={save.isPending}>{save.isPending ? "Saving…" : "Save part"}</Button></div> : null}
    </form>
  );
}

export function PartView({ id, initial }: { id: number; initial: PartDetailWire }) {
  const q = useQuery({ ...partQuery(id), initialData: initial, refetchInterval: LIVE_POLL_MS });
  const split = useQuery(splitLinksQuery(id));
  const d = q.data;
  const a = d.current?.analysis as AnalysisJson | undefined;
  return (
    <>
      <nav aria-label="Breadcrumb" className="mb-2 text-xs text-ink-soft">
        <Link href="/bench" className="hover:underline">Bench</Link>
        {d.trail.map((t) => (
          <span key={t.id}> / <Link href={`/bench/assemblies/${t.id}`} className="hover:underline">{t.name}</Link></span>
        ))}
      </nav>
      <PageHeader title={d.part.name} lead={`${d.part.quantity} needed · ${d.part.material}${d.part.colour ? `, ${d.part.colour}` : ""} · ${d.part.layerHeightMm} mm layers, ${d.part.walls} walls, ${d.part.infillPercent} % infill`} />
      {q.isError ? <Notice tone="fail" title="The latest changes could not be loaded.">{q.error.message}</Notice> : null}
      <div className="grid gap-8 lg:grid-cols-[1fr_22rem]">
        <div className="flex flex-col gap-6">
          <ViewerPanel d={d} />
          <MeshHealthPanel d={d} />
          {d.canEdit ? <FileDrop target={{ kind: "version", partId: id }} /> : null}
          <PartStatusPanel d={d} />
          {split.data?.pieces.length ? (
            <p className="rounded-md border border-rule bg-sheet px-4 py-3 text-sm text-ink-soft">This part was split into {split.data.pieces.length} pieces; send the pieces instead.</p>
          ) : (
            <SendToWorkshop partId={id} canEdit={d.canEdit && d.access !== "workshop"} />
          )}
          <section aria-labelledby="history-h" className="flex flex-col gap-2">
            <h2 id="history-h">Mesh history</h2>
            {d.files.length === 0 ? <p className="text-sm text-ink-soft">No uploads yet.</p> : (
              <ol className="flex flex-col gap-1 text-sm">
                {d.files.map((f) => (
                  <li key={f.id}>
                    Version {f.versionNo}{f.id === d.current?.id ? " (current)" : ""} · {f.format === "step" ? (
                      <>
                        <a className="underline" href={`/api/files/${f.id}?source=1`}>{f.originalName}</a> (mesh: <a className="underline" href={`/api/files/${f.id}`}>3MF</a>)
                      </>
                    ) : (
                      <a className="underline" href={`/api/files/${f.id}`}>{f.originalName}</a>
                    )}{" "}
                    · {f.format === "step" ? "units from the file" : f.units === "in" ? "inches" : "mm"} · {f.uploadedBy} · {new Date(f.uploadedAt).toLocaleString("en-GB")}
                  </li>
                ))}
              </ol>
            )}
          </section>
        </div>
        <aside className="flex flex-col gap-6">
          <section aria-labelledby="numbers-h" className="flex flex-col gap-2">
            <h2 id="numbers-h">Figures</h2>
            {a ? <PrintedFigures d={d} a={a} /> : null}
            {a ? <><h3 className="mt-2 text-sm font-semibold">The file as drawn</h3><PartNumbers a={a} /></> : <p className="text-sm text-ink-soft">Figures appear once a mesh is uploaded.</p>}
          </section>
          <section aria-labelledby="fits-h" className="flex flex-col gap-2">
            <h2 id="fits-h">Printers it fits</h2>
            {d.fit.printers === 0 ? <p className="text-sm text-ink-soft">No printers are set up in the workshop yet.</p> : !a ? <p className="text-sm text-ink-soft">Upload a mesh to check.</p> : (
              <ul className="flex flex-col gap-1 text-sm">
                {d.fit.fits.map((f) => <li key={f.printerId}>{f.fits ? "✓" : "✕"} {f.name}{f.fits ? "" : `: ${f.reason}`}</li>)}
              </ul>
            )}
            {a && d.fit.printers > 0 && !d.fit.fits.some((f) => f.fits) ? <Notice tone="warn" title="It fits no printer as it stands." /> : null}
          </section>
          <EditForm d={d} />
        </aside>
      </div>
    </>
  );
}
