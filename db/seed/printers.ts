// Demo printers, materials, spools, opening hours and a short history of finished plates for the
// invented Kettle Lane Workshop. Idempotent: rows are keyed by name or label and inserted when missing;
// a printer's history and the week's hours are written only when it has none.
import { eq, inArray } from "drizzle-orm";
import type { MySql2Database } from "drizzle-orm/mysql2";
import { MATERIALS } from "../../lib/estimate/materials";
import type { MaterialType } from "../../lib/validation/printers";
import * as schema from "../schema";

type D = MySql2Database<typeof schema>;
const { attendedHours, materials, printerMaterials, printHistory, printers, spools } = schema;

const demoPrinters: { name: string; x: number; y: number; h: number; nozzle: number; enclosed: boolean; rate: number; materials: MaterialType[] }[] = [
  { name: "Wren", x: 180, y: 180, h: 180, nozzle: 0.4, enclosed: false, rate: 250, materials: ["pla", "petg", "tpu"] },
  { name: "Heron", x: 220, y: 220, h: 250, nozzle: 0.4, enclosed: false, rate: 300, materials: ["pla", "petg", "tpu"] },
  { name: "Kestrel", x: 220, y: 220, h: 250, nozzle: 0.6, enclosed: false, rate: 320, materials: ["pla", "petg"] },
  { name: "Osprey", x: 256, y: 256, h: 256, nozzle: 0.4, enclosed: true, rate: 450, materials: ["pla", "petg", "abs", "asa", "nylon", "pc"] },
];

// Prices per kg in cents: invented for the demo.
const demoMaterials: { name: string; type: MaterialType; price: number }[] = [
  { name: "PLA", type: "pla", price: 2200 },
  { name: "PETG", type: "petg", price: 2500 },
  { name: "ABS", type: "abs", price: 2400 },
  { name: "ASA", type: "asa", price: 3000 },
  { name: "TPU 95A", type: "tpu", price: 3800 },
  { name: "Nylon PA6", type: "nylon", price: 5200 },
  { name: "PC", type: "pc", price: 4600 },
];

const demoSpools: { label: string; material: string; colour: string; initial: number; left: number; on?: string }[] = [
  { label: "KL-PLA-01", material: "PLA", colour: "White", initial: 1000, left: 820, on: "Heron" },
  { label: "KL-PLA-02", material: "PLA", colour: "Black", initial: 1000, left: 1000 },
  { label: "KL-PLA-03", material: "PLA", colour: "Orange", initial: 1000, left: 140 },
  { label: "KL-PETG-01", material: "PETG", colour: "Blue", initial: 1000, left: 610 },
  { label: "KL-PETG-02", material: "PETG", colour: "Black", initial: 1000, left: 900 },
  { label: "KL-PETG-03", material: "PETG", colour: "Green", initial: 1000, left: 950 },
  { label: "KL-PETG-04", material: "PETG", colour: "White", initial: 750, left: 700 },
  { label: "KL-PLA-04", material: "PLA", colour: "Grey", initial: 1000, left: 880 },
  { label: "KL-TPU-02", material: "TPU 95A", colour: "Black", initial: 500, left: 480 },
  { label: "KL-ABS-01", material: "ABS", colour: "Grey", initial: 1000, left: 900, on: "Osprey" },
  { label: "KL-ASA-01", material: "ASA", colour: "Black", initial: 750, left: 700 },
  { label: "KL-TPU-01", material: "TPU 95A", colour: "Clear", initial: 500, left: 450 },
  { label: "KL-PA-01", material: "Nylon PA6", colour: "Natural", initial: 750, left: 750 },
  { label: "KL-PC-01", material: "PC", colour: "Clear", initial: 1000, left: 980 },
];

// Mon–Fri 09:00–21:00, Sat 10:00–16:00, Sunday closed, in the workshop's zone.
const demoHours = [1, 2, 3, 4, 5].map((weekday) => ({ weekday, opensAt: "09:00", closesAt: "21:00" })).concat([{ weekday: 6, opensAt: "10:00", closesAt: "16:00" }]);

// Finished plates: [estimated min, actual min, estimated g, weighed g or null]. Heron runs a little
// slow; one plate was paused overnight (the median shrugs it off).
const demoHistory: Record<string, [number, number, number, number | null][]> = {
  Heron: [
    [95, 104, 38, 40],
    [180, 199, 75, null],
    [62, 66, 21, 22],
    [240, 610, 96, null],
    [130, 142, 52, 55],
    [75, 81, 30, null],
  ],
  Osprey: [
    [210, 214, 88, 90],
    [120, 118, 41, null],
    [300, 309, 130, 133],
  ],
};

export async function seedPrinters(d: D): Promise<void> {
  for (const p of demoPrinters) {
    await d
      .insert(printers)
      .ignore()
      .values({ name: p.name, bedXMm: p.x, bedYMm: p.y, heightMm: p.h, nozzleMm: p.nozzle, enclosed: p.enclosed ? 1 : 0, hourlyRateCents: p.rate });
  }
  const rows = await d.select({ id: printers.id, name: printers.name }).from(printers).where(inArray(printers.name, demoPrinters.map((p) => p.name)));
  const printerId = new Map(rows.map((r) => [r.name, r.id]));
  for (const p of demoPrinters) {
    const id = printerId.get(p.name);
    if (id) await d.insert(printerMaterials).ignore().values(p.materials.map((m) => ({ printerId: id, materialType: m })));
  }

  for (const m of demoMaterials) {
    const ref = MATERIALS[m.type];
    await d.insert(materials).ignore().values({ name: m.name, type: m.type, densityGcm3: ref.densityGcm3, densitySource: ref.densitySource, pricePerKgCents: m.price });
  }
  const mats = await d.select({ id: materials.id, name: materials.name }).from(materials);
  const materialId = new Map(mats.map((r) => [r.name, r.id]));
  for (const s of demoSpools) {
    const mid = materialId.get(s.material);
    if (!mid) continue;
    const [exists] = await d.select({ id: spools.id }).from(spools).where(eq(spools.label, s.label));
    if (exists) continue;
    const on = s.on ? printerId.get(s.on) : undefined;
    // A printer holds one spool: only load it when the printer is free.
    const [taken] = on ? await d.select({ id: spools.id }).from(spools).where(eq(spools.loadedPrinterId, on)) : [];
    const load = on && !taken ? { loadedPrinterId: on, loadedAt: new Date() } : {};
    await d.insert(spools).ignore().values({ materialId: mid, label: s.label, colour: s.colour, gramsInitial: s.initial, gramsRemaining: s.left, ...load });
  }

  const [anyHours] = await d.select({ id: attendedHours.id }).from(attendedHours).limit(1);
  if (!anyHours) await d.insert(attendedHours).ignore().values(demoHours);

  const day = 86_400_000;
  for (const [name, plates] of Object.entries(demoHistory)) {
    const id = printerId.get(name);
    if (!id) continue;
    const [has] = await d.select({ id: printHistory.id }).from(printHistory).where(eq(printHistory.printerId, id)).limit(1);
    if (has) continue;
    const start = Date.now() - plates.length * day;
    await d.insert(printHistory).values(
      plates.map(([estimatedMinutes, actualMinutes, estimatedGrams, actualGrams], i) => ({
        printerId: id,
        estimatedMinutes,
        actualMinutes,
        estimatedGrams,
        actualGrams,
        finishedAt: new Date(start + i * day),
      })),
    );
  }
}
