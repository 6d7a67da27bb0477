import "server-only";
import { asc, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { materials, spools, type MaterialType } from "@/db/schema";
import type { Executor } from "./mail";

/** Colours compare trimmed and lower-case; an empty colour means any. */
export const normColour = (c: string) => c.trim().toLowerCase() || "any";

export interface StockSpool {
  type: MaterialType;
  colour: string;
  grams: number;
  loaded: boolean;
}

/** The workshop's spools with filament left (material family and normalised colour), fullest first. */
export async function workshopSpools(d: Executor = db()): Promise<StockSpool[]> {
  const rows = await d
    .select({ type: materials.type, colour: spools.colour, grams: spools.gramsRemaining, printerId: spools.loadedPrinterId })
    .from(spools)
    .innerJoin(materials, eq(materials.id, spools.materialId))
    .where(sql`${spools.gramsRemaining} > 0`)
    .orderBy(sql`${spools.gramsRemaining} DESC`, asc(spools.id));
  return rows.map((r) => ({ type: r.type, colour: normColour(r.colour), grams: r.grams, loaded: r.printerId !== null }));
}

/**
 * A part without a colour ("any") prints on a spool the workshop has: one already loaded if there
 * is one, else the fullest. A part with a colour keeps it (the plan leaves it waiting when no spool matches).
 */
export function colourFor(type: MaterialType, colour: string, stock: readonly StockSpool[]): string {
  if (colour !== "any") return colour;
  const of = stock.filter((s) => s.type === type);
  return (of.find((s) => s.loaded) ?? of[0])?.colour ?? colour;
}

