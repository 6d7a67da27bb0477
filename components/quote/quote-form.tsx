"use client";

import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { Field, TextInput } from "@/components/ui/field";
import { MATERIALS } from "@/lib/estimate/materials";
import { materialTypes, quotePartInput, type MaterialType } from "@/lib/validation/printers";
import { QuotePanel, type QuotePanelInput } from "./quote-panel";

/** Invented sample parts, measured by hand from their simple shapes (boxes and a ring). */
export const DEMO_PARTS: { key: string; label: string; geometry: Pick<QuotePanelInput, "volumeMm3" | "areaMm2" | "heightMm" | "widthMm" | "depthMm" | "footprintAreaMm2"> }[] = [
  // 30 × 12 × 10 mm block: V = 3600, A = 2(360 + 300 + 120) = 1560, footprint 360.
  { key: "clip", label: "Cable clip (30 × 12 × 10 mm)", geometry: { volumeMm3: 3600, areaMm2: 1560, heightMm: 10, widthMm: 30, depthMm: 12, footprintAreaMm2: 360 } },
  // 80 × 20 × 60 mm block: V = 96000, A = 2(1600 + 4800 + 1200) = 15200, footprint 1600.
  { key: "bracket", label: "Shelf bracket (80 × 20 × 60 mm)", geometry: { volumeMm3: 96000, areaMm2: 15200, heightMm: 60, widthMm: 80, depthMm: 20, footprintAreaMm2: 1600 } },
  // Ring, radii 100 and 95 mm, 40 mm tall: V = π(100² − 95²)·40, A = 2π(195)·40 + 2π(975), footprint π·975.
  { key: "ring", label: "Lamp shade ring (Ø 200 × 40 mm)", geometry: { volumeMm3: 122522, areaMm2: 55135, heightMm: 40, widthMm: 200, depthMm: 200, footprintAreaMm2: 3063 } },
];

type Values = Record<"volumeMm3" | "areaMm2" | "heightMm" | "widthMm" | "depthMm" | "footprintAreaMm2" | "layerHeightMm" | "wallCount" | "infillPercent", string> & { material: MaterialType };

const numberFields: { name: Exclude<keyof Values, "material">; label: string; step: string }[] = [
  { name: "volumeMm3", label: "Volume (mm³)", step: "1" },
  { name: "areaMm2", label: "Surface area (mm²)", step: "1" },
  { name: "heightMm", label: "Height (mm)", step: "0.1" },
  { name: "widthMm", label: "Width (mm)", step: "0.1" },
  { name: "depthMm", label: "Depth (mm)", step: "0.1" },
  { name: "footprintAreaMm2", label: "Footprint (mm²)", step: "1" },
  { name: "layerHeightMm", label: "Layer height (mm)", step: "0.02" },
  { name: "wallCount", label: "Walls", step: "1" },
  { name: "infillPercent", label: "Infill (%)", step: "1" },
];

function fromDemo(key: string, base: { layerHeightMm: number; wallCount: number; infillPercent: number }): Values {
  const g = (DEMO_PARTS.find((d) => d.key === key) ?? DEMO_PARTS[0]!).geometry;
  return {
    volumeMm3: String(g.volumeMm3),
    areaMm2: String(g.areaMm2),
    heightMm: String(g.heightMm),
    widthMm: String(g.widthMm ?? ""),
    depthMm: String(g.depthMm ?? ""),
    footprintAreaMm2: String(g.footprintAreaMm2 ?? ""),
    layerHeightMm: String(base.layerHeightMm),
    wallCount: String(base.wallCount),
    infillPercent: String(base.infillPercent),
    material: "pla",
  };
}

/** Anyone signed in enters a part's figures (or picks a sample part) and sees its quote. */
export function QuoteForm({ defaults }: { defaults: { layerHeightMm: number; wallCount: number; infillPercent: number } }) {
  const [demo, setDemo] = useState(DEMO_PARTS[0]!.key);
  const [values, setValues] = useState<Values>(() => fromDemo(demo, defaults));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const [input, setInput] = useState<QuotePanelInput | null>(null);

  function onSubmit(e: FormEvent) {
    e.preventDefault();
    // Empty optional fields are left out rather than sent as "".
    const body = Object.fromEntries(Object.entries(values).filter(([, v]) => v !== ""));
    const parsed = quotePartInput.safeParse(body);
    if (!parsed.success) {
      setFieldErrors(z.flattenError(parsed.error).fieldErrors);
      return;
    }
    setFieldErrors({});
    setInput(parsed.data);
  }

  return (
    <div className="flex flex-col gap-6">
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Part to quote">
        <Field label="Sample part" name="demo">
          <select
            id="demo"
            value={demo}
            onChange={(e) => {
              setDemo(e.target.value);
              setValues((v) => ({ ...fromDemo(e.target.value, defaults), material: v.material }));
            }}
            className="max-w-sm rounded-md border border-rule bg-sheet px-3 py-2 text-sm"
          >
            {DEMO_PARTS.map((d) => (
              <option key={d.key} value={d.key}>
                {d.label}
              </option>
            ))}
          </select>
        </Field>
        <div className="grid gap-4 sm:grid-cols-3">
          {numberFields.map((f) => (
            <Field key={f.name} label={f.label} name={f.name} errors={fieldErrors[f.name]}>
              <TextInput id={f.name} name={f.name} type="number" step={f.step} className="tabular-nums" value={values[f.name]} invalid={!!fieldErrors[f.name]} onChange={(e) => setValues((v) => ({ ...v, [f.name]: e.target.value }))} />
            </Field>
          ))}
          <Field label="Material" name="material" errors={fieldErrors.material}>
            <select id="material" value={values.material} onChange={(e) => setValues((v) => ({ ...v, material: e.target.value as MaterialType }))} className="rounded-md border border-rule bg-sheet px-3 py-2 text-sm">
              {materialTypes.map((t) => (
                <option key={t} value={t}>
                  {MATERIALS[t].name}
                </option>
              ))}
            </select>
          </Field>
        </div>
        <div>
          <Button type="submit">Get quote</Button>
        </div>
      </form>
      {input ? <QuotePanel input={input} /> : null}
    </div>
  );
}
