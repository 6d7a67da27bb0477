import type { PlanInstance } from "./schema";

/** Mulberry32: a small, well-known 32-bit seeded generator; good enough for test data. */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export type GenerateOptions = {
  seed: number;
  printers: number;
  /** Total part instances wanted (quantities add up to about this). */
  instances: number;
  beds?: [number, number][];
  materials?: string[];
  /** "all" = attended round the clock; "workdays" = Monday-Friday 08:00-18:00; "evening" adds a past-midnight shift. */
  hours?: "all" | "workdays" | "evening";
  owners?: number;
  dueFraction?: number;
  maintenance?: boolean;
  changeover?: boolean;
};

const ALL_DAYS = [1, 2, 3, 4, 5, 6, 7];

/** An invented workshop and queue, reproducible from its seed. */
export function generateInstance(o: GenerateOptions): PlanInstance {
  const rnd = mulberry32(o.seed);
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rnd() * xs.length)]!;
  const uniform = (lo: number, hi: number) => lo + rnd() * (hi - lo);
  const beds = o.beds ?? [[180, 180], [220, 220], [256, 256]];
  const materials = o.materials ?? ["PLA", "PETG", "ABS", "TPU"];
  const now = Date.UTC(2026, 2, 23, 7, 30); // a Monday morning, 08:30 in Berlin
  const printers: PlanInstance["printers"] = [];
  for (let i = 0; i < o.printers; i++) {
    const bed = beds[i % beds.length]!;
    // Every material is on at least one printer; most printers take two or three.
    const own = new Set([materials[i % materials.length]!, pick(materials), pick(materials)]);
    const unavailable = o.maintenance && rnd() < 0.3
      ? [{ from: new Date(now + uniform(2, 30) * 3_600_000).toISOString(), to: "" }]
      : [];
    for (const w of unavailable) w.to = new Date(Date.parse(w.from) + uniform(2, 8) * 3_600_000).toISOString();
    const loadedMaterial = [...own][0]!;
    printers.push({
      id: `pr-${String(i + 1).padStart(2, "0")}`,
      bed: [bed[0], bed[1]],
      height: pick([180, 220, 250]),
      materials: [...own].sort(),
      nozzle: 0.4,
      startup_minutes: Math.round(uniform(4, 10)),
      unavailable,
      loaded: o.changeover ? { material: loadedMaterial, color: "black" } : undefined,
      changeover_minutes: o.changeover ? 15 : 0,
    });
  }
  const parts: PlanInstance["parts"] = [];
  let made = 0;
  for (let i = 0; made < o.instances; i++) {
    const quantity = Math.min(o.instances - made, 1 + Math.floor(rnd() ** 3 * 12));
    made += quantity;
    const w = Math.round(uniform(15, 90));
    const d = Math.round(uniform(15, 90));
    const due = rnd() < (o.dueFraction ?? 0.2) ? new Date(now + uniform(4, 120) * 3_600_000).toISOString() : null;
    parts.push({
      id: `part-${String(i + 1).padStart(4, "0")}`,
      footprint: [w, d],
      height: Math.round(uniform(5, 170)),
      minutes: Math.round(uniform(15, 150)),
      material: pick(materials),
      color: rnd() < 0.8 ? "black" : "white",
      layer_height: 0.2,
      nozzle: 0.4,
      quantity,
      due,
      priority: rnd() < 0.1 ? 1 : 0,
      owner: `member-${1 + Math.floor(rnd() ** 2 * (o.owners ?? 6))}`,
    });
  }
  const hours = o.hours ?? "all";
  const attended =
    hours === "all"
      ? ALL_DAYS.map((weekday) => ({ weekday, open: "00:00", close: "00:00" }))
      : hours === "workdays"
        ? [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "08:00", close: "18:00" }))
        : [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "16:00", close: "01:00" }));
  return { now: new Date(now).toISOString(), timezone: "Europe/Berlin", attended, margin_mm: 5, gap_mm: 3, printers, parts };
}

/**
 * The fairness case (bench and tests): one member sends `heavy` copies first, then `light` members
 * send three small copies each, all PLA black, on four printers. Deterministic from its seed.
 */
export function fairnessInstance(seed: number, heavy = 120, light = 5, hours: GenerateOptions["hours"] = "all"): PlanInstance {
  const base = generateInstance({ seed, printers: 4, instances: heavy, hours, owners: 1, dueFraction: 0 });
  const parts: PlanInstance["parts"] = base.parts.map((p) => ({ ...p, material: "PLA", color: "black", priority: 0, owner: "heavy" }));
  const rnd = mulberry32(seed + 7);
  for (let m = 1; m <= light; m++) {
    parts.push({
      id: `light-${m}`,
      footprint: [Math.round(15 + rnd() * 15), Math.round(15 + rnd() * 15)],
      height: 10,
      minutes: Math.round(20 + rnd() * 20),
      material: "PLA",
      color: "black",
      layer_height: 0.2,
      nozzle: 0.4,
      quantity: 3,
      due: null,
      priority: 0,
      owner: `light-${m}`,
    });
  }
  const printers = base.printers.map((p) => ({ ...p, materials: ["PLA"], height: 250 }));
  return { ...base, printers, parts };
}

/** From `now`, minutes until the last copy of each owner is printed. */
export function lastCopyMinutes(inst: PlanInstance, plates: readonly { end: string; items: readonly { part: string }[] }[]): Map<string, number> {
  const owner = new Map(inst.parts.map((p) => [p.id, p.owner ?? "(no owner)"]));
  const nowMs = Date.parse(inst.now);
  const out = new Map<string, number>();
  for (const plate of plates) {
    const t = (Date.parse(plate.end) - nowMs) / 60_000;
    for (const it of plate.items) {
      const o = owner.get(it.part)!;
      out.set(o, Math.max(out.get(o) ?? 0, t));
    }
  }
  return out;
}
