import "server-only";
import { and, asc, eq, sql } from "drizzle-orm";
import { db } from "@/db";
import { assemblies, partFiles, partInstances, partOrientations, parts, plateItems, plates, printers, users } from "@/db/schema";
import { readMesh, write3mf, type TriangleSoup } from "@/lib/mesh";
import type { Affine } from "@/lib/mesh/affine";
import { applyOrientation, type Quat } from "@/lib/orient";
import { can } from "@/lib/permissions";
import { AppError } from "./errors";
import { jsonOf, rotationOfQuaternion } from "./orientation";
import { BED_MARGIN_MM } from "./planner";
import { plateLabel } from "./plates";
import type { SessionUser } from "./session";
import { blobStore } from "./storage";

const noPlate = () => new AppError("not_found", "There is no such plate, or none of your parts are on it.");

/**
 * A plate with its bed and items as placed. Operators and admins see everything; a member sees
 * the plate only when one of their copies is on it, and other members' parts without names.
 */
export async function plateDetail(user: SessionUser, id: number) {
  if (!can(user.role, "plates:view")) throw noPlate();
  const d = db();
  const [p] = await d
    .select({ id: plates.id, status: plates.status, material: plates.material, colour: plates.colour, plannedStart: plates.plannedStart, plannedEnd: plates.plannedEnd, startedAt: plates.startedAt, endedAt: plates.endedAt, runsUnattended: plates.runsUnattended, caution: plates.caution, estimatedMinutes: plates.estimatedMinutes, estimatedGrams: plates.estimatedGrams, actualMinutes: plates.actualMinutes, actualGrams: plates.actualGrams, shelfLabel: plates.shelfLabel, reason: plates.reason, version: plates.version, printerId: printers.id, printerName: printers.name, bedX: printers.bedXMm, bedY: printers.bedYMm, height: printers.heightMm })
    .from(plates)
    .innerJoin(printers, eq(printers.id, plates.printerId))
    .where(eq(plates.id, id));
  if (!p) throw noPlate();
  const rows = await d
    .select({ itemId: plateItems.id, instanceId: plateItems.instanceId, memberId: plateItems.memberId, member: users.name, x: plateItems.x, y: plateItems.y, rotated: plateItems.rotated, sizeX: plateItems.sizeX, sizeY: plateItems.sizeY, sizeZ: plateItems.sizeZ, minutes: plateItems.minutes, grams: plateItems.grams, copyNo: partInstances.copyNo, partId: parts.id, partName: parts.name, assemblyName: assemblies.name, fileId: sql<number | null>`COALESCE(${plateItems.fileId}, ${parts.currentFileId})` })
    .from(plateItems)
    .innerJoin(partInstances, eq(partInstances.id, plateItems.instanceId))
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .innerJoin(assemblies, eq(assemblies.id, parts.assemblyId))
    .innerJoin(users, eq(users.id, plateItems.memberId))
    .where(eq(plateItems.plateId, id))
    .orderBy(asc(plateItems.id));
  const staff = can(user.role, "plates:act");
  if (!staff && !rows.some((r) => r.memberId === user.id)) throw noPlate();
  const items = rows.map((r) => {
    const mine = staff || r.memberId === user.id;
    return {
      itemId: r.itemId,
      mine: r.memberId === user.id,
      label: mine ? `${r.partName} #${r.copyNo}` : "Another member's part",
      member: staff ? r.member : null,
      partId: mine ? r.partId : null,
      fileId: mine ? r.fileId : null,
      assemblyName: mine ? r.assemblyName : null,
      x: r.x,
      y: r.y,
      rotated: r.rotated === 1,
      // Extents on the bed after the turn.
      w: r.rotated ? r.sizeY : r.sizeX,
      d: r.rotated ? r.sizeX : r.sizeY,
      h: r.sizeZ,
      minutes: r.minutes,
      grams: r.grams,
    };
  });
  return { plate: { ...p, runsUnattended: p.runsUnattended === 1, label: plateLabel(p.id, p.printerName), marginMm: BED_MARGIN_MM }, items, staff };
}

export type PlateDetail = Awaited<ReturnType<typeof plateDetail>>;

function bboxMin(soup: TriangleSoup): [number, number, number] {
  const a = soup.positions;
  let x = Infinity, y = Infinity, z = Infinity;
  for (let i = 0; i < a.length; i += 3) {
    x = Math.min(x, a[i]!);
    y = Math.min(y, a[i + 1]!);
    z = Math.min(z, a[i + 2]!);
  }
  return [x, y, z];
}

/**
 * Where the plan puts a part: its bounding box's lower corner to the bed origin, a quarter turn
 * about Z when rotated (x, y) → (−y, x), then to (x, y) on the bed. 3MF transforms are 3 × 4,
 * stored column by column as m00 m01 m02 m10 … m32 (3MF Core Specification, 3.3 "Transforms").
 */
export function placement(min: [number, number, number], at: { x: number; y: number; rotated: boolean; depth: number }): Affine {
  const [mx, my, mz] = min;
  if (!at.rotated) return [1, 0, 0, 0, 1, 0, 0, 0, 1, at.x - mx, at.y - my, -mz];
  return [0, 1, 0, -1, 0, 0, 0, 0, 1, at.x + at.depth + my, at.y - mx, -mz];
}

/** The plate as a 3MF file: one object per part copy, in its chosen orientation, placed where the plan put it, resting on the bed, in mm. Operators and admins. */
export async function plate3mf(user: SessionUser, id: number): Promise<{ filename: string; bytes: Uint8Array }> {
  if (!can(user.role, "plates:act")) throw new AppError("forbidden", "Only operators and admins download plates.");
  const det = await plateDetail(user, id);
  const files = new Map<number, { soup: TriangleSoup; min: [number, number, number] }>();
  const objects: Parameters<typeof write3mf>[0] = [];
  for (const it of det.items) {
    if (it.fileId === null) throw new AppError("conflict", `${it.label} has no mesh any more; re-plan the plate.`);
    let f = files.get(it.fileId);
    if (!f) {
      const [row] = await db().select({ sha: partFiles.sha256, units: partFiles.units, name: partFiles.originalName, partId: partFiles.partId }).from(partFiles).where(eq(partFiles.id, it.fileId));
      if (!row) throw new AppError("conflict", `The mesh of ${it.label} is missing.`);
      let soup = readMesh(await blobStore().read(row.sha), { filename: row.name, units: row.units }).soup;
      // Each copy lies as the plan placed it: turned into the part's chosen orientation for this file.
      const [chosen] = await db()
        .select({ q: partOrientations.quaternion })
        .from(partOrientations)
        .where(and(eq(partOrientations.partId, row.partId), eq(partOrientations.fileId, it.fileId), eq(partOrientations.kind, "chosen")))
        .limit(1);
      if (chosen) soup = applyOrientation(soup, rotationOfQuaternion(jsonOf<Quat>(chosen.q)));
      f = { soup, min: bboxMin(soup) };
      files.set(it.fileId, f);
    }
    // depth = the part's extent along y before the turn, which becomes its width along x.
    objects.push({ name: it.label, mesh: f.soup, transform: placement(f.min, { x: it.x, y: it.y, rotated: it.rotated, depth: it.w }) });
  }
  return { filename: `plate-${id}.3mf`, bytes: write3mf(objects) };
}
