import "server-only";
import { and, asc, eq, inArray } from "drizzle-orm";
import { db } from "@/db";
import { partInstances, parts, plateItems, plates } from "@/db/schema";
import type { PartStatus } from "@/lib/status";
import { accessTo, subtreeIds } from "./assemblies";
import type { SessionUser } from "./session";

export interface AssemblyCompletion {
  /** The latest planned end over the copies on planned or printing plates (ISO), or null when none is on a plate. */
  allPrintedBy: string | null;
  copies: number;
  /** Off the printer already (printed or accepted). */
  printed: number;
  onPlates: number;
  /** Copies still to print that no live plate holds yet, with where they stand. */
  notPlanned: { partName: string; copyNo: number; status: PartStatus }[];
}

/**
 * When the last copy of an assembly (and everything below it) prints, from the live plates: the
 * maximum planned end of the plates, planned or printing, that hold its copies. Copies neither
 * printed nor on such a plate are listed, so the figure never claims more than the plates say.
 * The one place this figure is computed; every page that shows it calls this.
 */
export async function assemblyCompletion(user: SessionUser, assemblyId: number): Promise<AssemblyCompletion> {
  const info = await accessTo(user, assemblyId);
  const ids = subtreeIds(info.tree, assemblyId);
  const rows = await db()
    .select({ partName: parts.name, copyNo: partInstances.copyNo, status: partInstances.status, end: plates.plannedEnd, plateStatus: plates.status })
    .from(partInstances)
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .leftJoin(plateItems, eq(plateItems.activeInstanceId, partInstances.id))
    .leftJoin(plates, and(eq(plates.id, plateItems.plateId), inArray(plates.status, ["planned", "printing"])))
    .where(inArray(parts.assemblyId, ids))
    .orderBy(asc(parts.name), asc(partInstances.copyNo));
  let last: number | null = null;
  let printed = 0;
  let onPlates = 0;
  const notPlanned: AssemblyCompletion["notPlanned"] = [];
  for (const r of rows) {
    if (r.status === "printed" || r.status === "accepted") printed += 1;
    else if (r.end && r.plateStatus) {
      onPlates += 1;
      last = Math.max(last ?? 0, r.end.getTime());
    } else notPlanned.push({ partName: r.partName, copyNo: r.copyNo, status: r.status });
  }
  return { allPrintedBy: last === null ? null : new Date(last).toISOString(), copies: rows.length, printed, onPlates, notPlanned };
}
