import "server-only";
import { and, eq, ne } from "drizzle-orm";
import { materials, plates, printers, spools } from "@/db/schema";
import { AppError } from "./errors";
import type { Tx } from "./mail";
import { SPOOL_MARGIN } from "./materials";
import { normColour } from "./spool-stock";

export interface StartingPlate {
  id: number;
  printerId: number;
  material: string;
  colour: string;
  estimatedGrams: number;
}

const named = (type: string, colour: string) => `${type.toUpperCase()}${colour === "any" ? "" : ` ${colour}`}`;

/**
 * Before a plate starts, inside its transaction: when the operator picked a spool, load it on the
 * plate's printer (the spool that was on goes back on the shelf, as loading does elsewhere; a spool
 * taken from another printer must not be feeding a print there). Then the loaded spool must be the
 * plate's material and colour and hold its grams plus SPOOL_MARGIN.
 */
export async function readySpool(tx: Tx, p: StartingPlate, spoolId: number | null): Promise<{ spoolId: number; changed: boolean }> {
  const type = p.material.toLowerCase();
  const colour = normColour(p.colour);
  const wanted = named(type, colour);
  let changed = false;
  if (spoolId !== null) {
    const [s] = await tx
      .select({ id: spools.id, label: spools.label, type: materials.type, colour: spools.colour, on: spools.loadedPrinterId })
      .from(spools)
      .innerJoin(materials, eq(materials.id, spools.materialId))
      .where(eq(spools.id, spoolId))
      .for("update");
    if (!s) throw new AppError("invalid", "There is no such spool.", { spoolId: ["Pick one of the listed spools."] });
    if (s.type !== type || (colour !== "any" && normColour(s.colour) !== colour)) {
      const msg = `Spool ${s.label} is ${named(s.type, normColour(s.colour))}; this plate needs ${wanted}.`;
      throw new AppError("invalid", msg, { spoolId: [msg] });
    }
    if (s.on !== null && s.on !== p.printerId) {
      const [busy] = await tx
        .select({ id: plates.id, printer: printers.name })
        .from(plates)
        .innerJoin(printers, eq(printers.id, plates.printerId))
        .where(and(eq(plates.printerId, s.on), eq(plates.status, "printing"), ne(plates.id, p.id)));
      if (busy) throw new AppError("conflict", `Spool ${s.label} is feeding plate ${busy.id} on ${busy.printer}. Pick another spool, or wait until that plate is done.`);
    }
    if (s.on !== p.printerId) {
      const now = new Date();
      await tx.update(spools).set({ loadedPrinterId: null, loadedAt: null, updatedAt: now }).where(eq(spools.loadedPrinterId, p.printerId));
      await tx.update(spools).set({ loadedPrinterId: p.printerId, loadedAt: now, updatedAt: now }).where(eq(spools.id, s.id));
      changed = true;
    }
  }
  const [on] = await tx
    .select({ id: spools.id, label: spools.label, type: materials.type, colour: spools.colour, grams: spools.gramsRemaining })
    .from(spools)
    .innerJoin(materials, eq(materials.id, spools.materialId))
    .where(eq(spools.loadedPrinterId, p.printerId))
    .for("update");
  if (!on) throw new AppError("conflict", `No spool is loaded on this printer. Pick a ${wanted} spool in the start form.`);
  if (on.type !== type || (colour !== "any" && normColour(on.colour) !== colour)) {
    throw new AppError("conflict", `Spool ${on.label} (${named(on.type, normColour(on.colour))}) is on this printer; this plate needs ${wanted}. Pick a ${wanted} spool in the start form to change it.`);
  }
  const need = p.estimatedGrams * SPOOL_MARGIN;
  if (on.grams < need) throw new AppError("conflict", `Spool ${on.label} holds ${Math.floor(on.grams)} g; this plate needs about ${Math.ceil(need)} g with spare. Pick a fuller ${wanted} spool in the start form.`);
  return { spoolId: on.id, changed };
}
