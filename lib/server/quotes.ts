import "server-only";
import {
  DEFAULT_SETTINGS,
  DEFAULT_SUPPORT_DENSITY,
  estimatePart,
  MATERIALS,
  quoteAssembly,
  quoteCost,
  type AssemblyQuote,
  type CostBreakdown,
  type PrintSettings,
} from "@/lib/estimate";
import { can } from "@/lib/permissions";
import { fitOnPrinter } from "@/lib/rules/fit";
import type { MaterialType } from "@/db/schema";
import { desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { partFiles, plateItems, plates } from "@/db/schema";
import { materialKeyOf, type QuoteAssemblyInput, type QuotePartInput } from "@/lib/validation/printers";
import { AppError } from "./errors";
import { materialPrices } from "./materials";
import { partEnvelopes } from "./part-envelope";
import { getAssemblyDetail } from "./parts";
import { listPrinters, type Printer } from "./printers";
import type { SessionUser } from "./session";
import { getWorkshopSettings } from "./workshop";

/** Line width a little over the nozzle (0.45 mm for 0.4 mm): common practice, no source. */
export const LINE_WIDTH_PER_NOZZLE = 1.125;

export interface QuoteMaterial {
  id: number;
  name: string;
  type: MaterialType;
  densityGcm3: number;
  densitySource: string;
  pricePerKgCents: number;
}

/** One printer's price for a part: everything needed to keep it with a plate as charged. */
export interface PrinterQuote {
  printerId: number;
  printerName: string;
  state: Printer["state"];
  /** False when the part is taller (or wider, when given) than the build volume. */
  fits: boolean;
  hourlyRateCents: number;
  grams: number;
  minutes: number;
  /** The correction applied and how many finished plates it rests on. */
  timeFactor: number;
  gramsFactor: number;
  samples: number;
  gramsSamples: number;
  cost: CostBreakdown;
}

export interface PartQuote {
  currency: string;
  material: QuoteMaterial;
  /** The plate fee as the Ledger shares it: split evenly between the members on a plate (feeShare). */
  fee: FeeShare;
  /** Printers allowed this material, cheapest first among those the part fits; misfits last. */
  options: PrinterQuote[];
  quotedAt: string;
}

/**
 * The workshop's one fit rule (lib/rules/fit: the bed less the margin, a quarter turn allowed, build
 * height, material). A quote typed in without width and depth is checked on height and material only.
 */
function fitsOn(p: Printer, input: QuotePartInput): boolean {
  const footprint: [number, number] = [input.widthMm ?? 0, input.depthMm ?? 0];
  return fitOnPrinter({ footprint, height: input.heightMm }, { id: String(p.id), bed: [p.bedXMm, p.bedYMm], height: p.heightMm, materials: p.materials }, input.material).fits;
}

function settingsFor(input: QuotePartInput, nozzleMm: number): PrintSettings {
  return {
    ...DEFAULT_SETTINGS,
    layerHeightMm: input.layerHeightMm,
    wallCount: input.wallCount,
    lineWidthMm: nozzleMm * LINE_WIDTH_PER_NOZZLE,
    infill: input.infillPercent / 100,
    supportDensity: input.supports ? DEFAULT_SUPPORT_DENSITY : 0,
  };
}

async function pickMaterial(input: QuotePartInput): Promise<QuoteMaterial> {
  const rows = await materialPrices(input.material);
  const m = input.materialId ? rows.find((r) => r.id === input.materialId) : rows[0];
  if (!m) {
    const name = MATERIALS[input.material].name;
    throw new AppError("invalid", `The workshop has no ${name} in its price list.`, { material: [`No ${name} is priced yet.`] });
  }
  return { id: m.id, name: m.name, type: m.type, densityGcm3: m.densityGcm3, densitySource: m.densitySource, pricePerKgCents: m.pricePerKgCents };
}

function priceOn(p: Printer, input: QuotePartInput, material: QuoteMaterial, feeCents: number): PrinterQuote {
  const geometry = {
    volumeMm3: input.volumeMm3,
    areaMm2: input.areaMm2,
    heightMm: input.heightMm,
    footprintAreaMm2: input.footprintAreaMm2,
    supportVolumeMm3: input.supportVolumeMm3,
  };
  const e = estimatePart(geometry, settingsFor(input, p.nozzleMm), p, material, { calibration: p.calibration, feeCents });
  return {
    printerId: p.id,
    printerName: p.name,
    state: p.state,
    fits: fitsOn(p, input),
    hourlyRateCents: p.hourlyRateCents,
    grams: e.grams,
    minutes: e.time.minutes,
    timeFactor: p.calibration.timeFactor,
    gramsFactor: p.calibration.gramsFactor,
    samples: p.calibration.samples,
    gramsSamples: p.calibration.gramsSamples,
    cost: e.cost,
  };
}

export interface FeeShare {
  plateFeeCents: number;
  /** Distinct members per plate over the last finished plates (1 when there are none yet). */
  membersPerPlate: number;
  platesSeen: number;
  /** plateFeeCents ÷ membersPerPlate, rounded: what a copy's quote carries as its fee. */
  shareCents: number;
}

/** How many finished plates the fee share looks back over. */
const FEE_SHARE_PLATES = 50;

/**
 * The plate fee as it is really shared: the Ledger splits a plate's fee evenly between the members
 * whose copies are on it (memberCharges), so a quote carries the fee divided by the members a plate
 * has had on average over the workshop's last finished plates (the whole fee before there are any).
 */
export async function feeShare(plateFeeCents: number): Promise<FeeShare> {
  const recent = db()
    .select({ plateId: plateItems.plateId, members: sql<number>`COUNT(DISTINCT ${plateItems.memberId})`.as("members") })
    .from(plateItems)
    .innerJoin(plates, eq(plates.id, plateItems.plateId))
    .where(eq(plates.status, "finished"))
    .groupBy(plateItems.plateId, plates.endedAt)
    .orderBy(desc(plates.endedAt))
    .limit(FEE_SHARE_PLATES)
    .as("recent");
  const [row] = await db().select({ avg: sql<number | null>`AVG(${recent.members})`, n: sql<number>`COUNT(*)` }).from(recent);
  const membersPerPlate = Math.max(1, Number(row?.avg ?? 1));
  return { plateFeeCents, membersPerPlate, platesSeen: Number(row?.n ?? 0), shareCents: Math.round(plateFeeCents / membersPerPlate) };
}

/**
 * The price of one part on every printer that may print its material: grams × price per kg +
 * hours × rate (both after the printer's calibration) + its share of the plate fee (feeShare), cheapest first.
 */
export async function quotePart(user: SessionUser, input: QuotePartInput): Promise<PartQuote> {
  if (!can(user.role, "quotes:request")) throw new AppError("forbidden", "Your role may not ask for quotes.");
  const [settings, material, printers] = await Promise.all([getWorkshopSettings(), pickMaterial(input), listPrinters(user)]);
  const fee = await feeShare(settings.plateFeeCents);
  const able = printers.filter((p) => p.materials.includes(input.material));
  if (!able.length) {
    throw new AppError("invalid", `No printer here may print ${MATERIALS[input.material].name}.`, { material: ["No printer takes this material."] });
  }
  const options = able
    .map((p) => priceOn(p, input, material, fee.shareCents))
    .sort((a, b) => Number(b.fits) - Number(a.fits) || a.cost.totalCents - b.cost.totalCents || a.printerName.localeCompare(b.printerName));
  return { currency: settings.currency, material, fee, options, quotedAt: new Date().toISOString() };
}

export interface AssemblyQuoteResult extends AssemblyQuote {
  currency: string;
  /** Per part: the printer and material its line was priced on (the cheapest that fits). */
  choices: { label?: string; printerName: string; materialName: string; grams: number; minutes: number }[];
}

/** A whole assembly: each part on its cheapest fitting printer, the fee once for the assembly. */
export async function quoteAssemblyParts(
  user: SessionUser,
  input: QuoteAssemblyInput,
  { skipUnpriceable = false }: { skipUnpriceable?: boolean } = {},
): Promise<AssemblyQuoteResult & { skipped: { name: string; reason: string }[] }> {
  if (!can(user.role, "quotes:request")) throw new AppError("forbidden", "Your role may not ask for quotes.");
  const settings = await getWorkshopSettings();
  const lines: Parameters<typeof quoteAssembly>[0][number][] = [];
  const choices: AssemblyQuoteResult["choices"] = [];
  const skipped: { name: string; reason: string }[] = [];
  for (const [i, part] of input.parts.entries()) {
    const { label, quantity, ...one } = part;
    const name = label ?? `Part ${i + 1}`;
    let q: PartQuote;
    try {
      q = await quotePart(user, one);
    } catch (e) {
      if (!(skipUnpriceable && e instanceof AppError && e.code === "invalid")) throw e;
      skipped.push({ name, reason: e.message });
      continue;
    }
    const best = q.options.find((o) => o.fits);
    if (!best) {
      if (!skipUnpriceable) throw new AppError("invalid", `${name} fits on no printer that takes its material.`);
      skipped.push({ name, reason: "fits on no printer that takes its material" });
      continue;
    }
    const cost = quoteCost({ grams: best.grams, minutes: best.minutes }, best, q.material, 0);
    lines.push({ label, quantity, cost });
    choices.push({ label, printerName: best.printerName, materialName: q.material.name, grams: best.grams, minutes: best.minutes });
  }
  return { ...quoteAssembly(lines, lines.length ? settings.plateFeeCents : 0), currency: settings.currency, choices, skipped };
}

export interface StoredAnalysis {
  size?: [number, number, number];
  volume_mm3?: number;
  volume_reliable?: boolean;
  area_mm2?: number;
  footprint_area_mm2?: number;
}

/** A stored part as the quote needs it, or the reason it cannot be priced yet. */
export function partQuoteInput(
  analysis: unknown,
  part: { material: string; layerHeightMm: number; walls: number; infillPercent: number },
  placed?: { footprint: readonly [number, number]; height: number; supportVolumeMm3?: number } | null,
): { input: QuotePartInput } | { problem: string } {
  const a = readAnalysis(analysis);
  if (!a) return { problem: "no mesh uploaded" };
  if (!a.volume_reliable || !a.volume_mm3 || !a.area_mm2 || !a.size) return { problem: "mesh not closed" };
  const material = materialKeyOf(part.material);
  if (!material) return { problem: `no price list for ${part.material}` };
  return {
    input: {
      volumeMm3: a.volume_mm3,
      areaMm2: a.area_mm2,
      // As the part will lie on the bed: its chosen orientation, else the file as drawn.
      heightMm: placed?.height ?? a.size[2],
      widthMm: placed?.footprint[0] ?? a.size[0],
      depthMm: placed?.footprint[1] ?? a.size[1],
      footprintAreaMm2: a.footprint_area_mm2 || undefined,
      layerHeightMm: part.layerHeightMm,
      wallCount: part.walls,
      infillPercent: part.infillPercent,
      // The chosen orientation's support estimate counts in grams and time.
      supportVolumeMm3: placed?.supportVolumeMm3 || undefined,
      supports: (placed?.supportVolumeMm3 ?? 0) > 0,
      material,
    },
  };
}

/**
 * The quote of a stored assembly (and its sub-assemblies) for someone who may read it: each
 * priced part on its cheapest fitting printer × quantity, the fee once; parts that cannot be
 * priced yet are listed with the reason.
 */
export async function quoteStoredAssembly(user: SessionUser, assemblyId: number) {
  const detail = await getAssemblyDetail(user, assemblyId); // checks access
  const fileIds = detail.parts.map((p) => p.currentFileId).filter((x): x is number => x !== null);
  const files = fileIds.length ? await db().select({ id: partFiles.id, analysis: partFiles.analysis }).from(partFiles).where(inArray(partFiles.id, fileIds)) : [];
  const placed = await partEnvelopes(detail.parts.map((p) => p.id));
  const parts: QuoteAssemblyInput["parts"] = [];
  const unpriced: { name: string; reason: string }[] = [];
  // A split part is priced as its pieces only.
  for (const p of detail.parts.filter((x) => !x.splitInto)) {
    const r = partQuoteInput(files.find((f) => f.id === p.currentFileId)?.analysis, p, placed.get(p.id));
    if ("problem" in r) unpriced.push({ name: p.name, reason: r.problem });
    else parts.push({ ...r.input, label: p.name, quantity: p.quantity });
  }
  if (!parts.length) return { priced: null, unpriced };
  const { skipped, ...priced } = await quoteAssemblyParts(user, { parts }, { skipUnpriceable: true });
  return { priced: priced.lines.length ? priced : null, unpriced: [...unpriced, ...skipped] };
}

/** MariaDB keeps JSON as text, so the driver may hand back a string; accept both. */
function readAnalysis(v: unknown): StoredAnalysis | null {
  if (typeof v === "string") {
    try {
      return JSON.parse(v) as StoredAnalysis;
    } catch {
      return null;
    }
  }
  return (v ?? null) as StoredAnalysis | null;
}
