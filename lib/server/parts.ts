import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { assemblies, assemblyShares, partFiles, partInstances, parts, partSplits, statusEvents, users } from "@/db/schema";
import { fitPrinters, materialKeyOf } from "@/lib/rules";
import { allowedTargets, planTransition, type PartStatus } from "@/lib/rules/status";
import type { PartInput, PartPatch, StatusChangeInput } from "@/lib/validation/assemblies";
import { accessTo, canEdit, itemsOf, listShares, requireEdit, subtreeIds, visibleTrail, type Access } from "./assemblies";
import { AppError } from "./errors";
import { currentMeshHealth } from "./mesh-health";
import { partEnvelope, partEnvelopes, workshopPrinters, type PlacedEnvelope } from "./part-envelope";
import type { SessionUser } from "./session";
import { getWorkshopSettings } from "./workshop";

export const partColumns = {
  id: parts.id,
  assemblyId: parts.assemblyId,
  name: parts.name,
  quantity: parts.quantity,
  material: parts.material,
  colour: parts.colour,
  layerHeightMm: parts.layerHeightMm,
  walls: parts.walls,
  infillPercent: parts.infillPercent,
  notes: parts.notes,
  currentFileId: parts.currentFileId,
  version: parts.version,
};

const noPart = () => new AppError("not_found", "No such part, or it is not shared with you.");

/** The part's assembly access; a part the caller may not read is reported as missing. */
export async function partAccess(user: SessionUser, partId: number): Promise<{ access: Access; assemblyId: number }> {
  const [row] = await db().select({ assemblyId: parts.assemblyId }).from(parts).where(eq(parts.id, partId)).limit(1);
  if (!row) throw noPart();
  const a = await accessTo(user, row.assemblyId).catch(() => {
    throw noPart();
  });
  return { access: a.access, assemblyId: row.assemblyId };
}

export async function requirePartEdit(user: SessionUser, partId: number): Promise<{ assemblyId: number }> {
  const { access, assemblyId } = await partAccess(user, partId);
  if (!canEdit(access)) {
    throw new AppError("forbidden", access === "workshop" ? "The workshop reads members' parts but does not change them." : "This part is shared with you to read only.");
  }
  return { assemblyId };
}

type Tx = Parameters<Parameters<ReturnType<typeof db>["transaction"]>[0]>[0];

async function addInstances(tx: Tx, partId: number, from: number, to: number, by: number): Promise<void> {
  for (let copy = from; copy <= to; copy++) {
    const [res] = await tx.insert(partInstances).values({ partId, copyNo: copy }).$returningId();
    await tx.insert(statusEvents).values({ instanceId: res!.id, fromStatus: null, toStatus: "drafted", byUserId: by, reason: "Part added" });
  }
}

/** A new part starts drafted, one instance per copy needed, with the workshop's default settings. */
export async function createPart(user: SessionUser, assemblyId: number, input: PartInput): Promise<{ id: number }> {
  await requireEdit(user, assemblyId);
  const w = await getWorkshopSettings();
  return db().transaction(async (tx) => {
    const [res] = await tx
      .insert(parts)
      .values({
        assemblyId,
        name: input.name,
        quantity: input.quantity,
        material: input.material,
        colour: input.colour,
        notes: input.notes,
        layerHeightMm: input.layerHeightMm ?? w.defaultLayerHeightMm,
        walls: input.walls ?? w.defaultWalls,
        infillPercent: input.infillPercent ?? w.defaultInfillPercent,
      })
      .$returningId();
    const id = res!.id;
    await addInstances(tx, id, 1, input.quantity, user.id);
    return { id };
  });
}

/**
 * Raising the quantity adds drafted copies; lowering it removes the highest copies, but only
 * while they are still with the owner (drafted or ready), so nothing in the workshop vanishes.
 */
export async function updatePart(user: SessionUser, partId: number, patch: PartPatch): Promise<{ id: number; version: number }> {
  await requirePartEdit(user, partId);
  const { version, ...values } = patch;
  return db().transaction(async (tx) => {
    const [cur] = await tx.select({ quantity: parts.quantity }).from(parts).where(eq(parts.id, partId)).for("update");
    const [res] = await tx
      .update(parts)
      .set({ ...values, version: sql`${parts.version} + 1`, updatedAt: new Date() })
      .where(and(eq(parts.id, partId), eq(parts.version, version)));
    if (!cur || res.affectedRows === 0) throw new AppError("conflict", "Someone changed this part since you opened it. Reload to see their changes.");
    const q = values.quantity;
    if (q !== undefined && q > cur.quantity) await addInstances(tx, partId, cur.quantity + 1, q, user.id);
    if (q !== undefined && q < cur.quantity) {
      const extra = await tx
        .select({ id: partInstances.id, status: partInstances.status })
        .from(partInstances)
        .where(and(eq(partInstances.partId, partId), sql`${partInstances.copyNo} > ${q}`));
      if (extra.some((e) => e.status !== "drafted" && e.status !== "ready")) {
        throw new AppError("conflict", "Some of the copies you would remove are already in the workshop.", { quantity: ["Copies already queued or further along cannot be removed."] });
      }
      if (extra.length) await tx.delete(partInstances).where(inArray(partInstances.id, extra.map((e) => e.id)));
    }
    return { id: partId, version: version + 1 };
  });
}

export async function deletePart(user: SessionUser, partId: number): Promise<void> {
  await requirePartEdit(user, partId);
  const busy = await db()
    .select({ n: sql<number>`COUNT(*)` })
    .from(partInstances)
    .where(and(eq(partInstances.partId, partId), inArray(partInstances.status, ["plated", "printing"])));
  if (Number(busy[0]?.n ?? 0) > 0) throw new AppError("conflict", "A copy of this part is on a plate or printing; it cannot be deleted now.");
  await db().delete(parts).where(eq(parts.id, partId));
}

/**
 * One status change, checked against the rules in lib/status and recorded with who, when and why.
 * The instance's version guards against two people moving the same copy at once.
 */
export async function changeStatus(user: SessionUser, partId: number, input: StatusChangeInput): Promise<{ status: PartStatus; reprints: number; version: number }> {
  const { access } = await partAccess(user, partId);
  return db().transaction(async (tx) => {
    const [inst] = await tx
      .select({ status: partInstances.status, reprints: partInstances.reprints, version: partInstances.version })
      .from(partInstances)
      .where(and(eq(partInstances.id, input.instanceId), eq(partInstances.partId, partId)))
      .for("update");
    if (!inst) throw new AppError("not_found", "No such copy of this part.");
    if (inst.version !== input.version) throw new AppError("conflict", "This copy changed since you opened it. Reload to see its status.");
    const plan = planTransition({ from: inst.status, to: input.to, role: user.role, canEdit: canEdit(access), reason: input.reason });
    if (!plan.ok) {
      const code = user.role === "member" && !canEdit(access) ? "forbidden" : "invalid";
      throw new AppError(code, plan.message, code === "invalid" ? { to: [plan.message] } : undefined);
    }
    const reprints = inst.reprints + (plan.reprint ? 1 : 0);
    await tx
      .update(partInstances)
      .set({ status: plan.final, reprints, version: sql`${partInstances.version} + 1`, updatedAt: new Date() })
      .where(eq(partInstances.id, input.instanceId));
    for (const [i, step] of plan.steps.entries()) {
      const reason = i === 0 ? input.reason : `Back to the queue for reprint ${reprints}`;
      await tx.insert(statusEvents).values({ instanceId: input.instanceId, fromStatus: step.from, toStatus: step.to, byUserId: user.id, reason });
    }
    return { status: plan.final, reprints, version: inst.version + 1 };
  });
}

/** One printer's answer on the part page. */
export interface FitResult {
  printerId: number;
  name: string;
  fits: boolean;
  /** Why not, in plain words; empty when it fits. */
  reason: string;
}

/** Which printers the part fits as it will lie on the bed (lib/rules/fit, the queue's own rule). */
export async function printerFits(envelope: PlacedEnvelope | null, material: string) {
  const { beds, envelopes } = await workshopPrinters();
  const fits: FitResult[] = envelope ? fitPrinters(envelope, envelopes, materialKeyOf(material), material).map((f) => ({ printerId: Number(f.printerId), name: f.name, fits: f.fits, reason: f.reason })) : [];
  return { printers: beds.length, fits, beds };
}

/** Everything the part page shows. */
export async function getPartDetail(user: SessionUser, partId: number) {
  const { access, assemblyId } = await partAccess(user, partId);
  const d = db();
  const [part] = await d.select(partColumns).from(parts).where(eq(parts.id, partId)).limit(1);
  if (!part) throw noPart();
  const info = await accessTo(user, assemblyId);
  const files = await d
    .select({
      id: partFiles.id,
      versionNo: partFiles.versionNo,
      originalName: partFiles.originalName,
      units: partFiles.units,
      format: partFiles.format,
      sha256: partFiles.sha256,
      analysis: partFiles.analysis,
      uploadedAt: partFiles.uploadedAt,
      uploadedBy: users.name,
    })
    .from(partFiles)
    .innerJoin(users, eq(users.id, partFiles.uploadedBy))
    .where(eq(partFiles.partId, partId))
    .orderBy(desc(partFiles.versionNo));
  const instances = await d
    .select({ id: partInstances.id, copyNo: partInstances.copyNo, status: partInstances.status, reprints: partInstances.reprints, version: partInstances.version })
    .from(partInstances)
    .where(eq(partInstances.partId, partId))
    .orderBy(asc(partInstances.copyNo));
  const events = instances.length
    ? await d
        .select({ id: statusEvents.id, instanceId: statusEvents.instanceId, from: statusEvents.fromStatus, to: statusEvents.toStatus, by: users.name, at: statusEvents.at, reason: statusEvents.reason })
        .from(statusEvents)
        .innerJoin(users, eq(users.id, statusEvents.byUserId))
        .where(inArray(statusEvents.instanceId, instances.map((i) => i.id)))
        .orderBy(desc(statusEvents.at), desc(statusEvents.id))
    : [];
  const current = files.find((f) => f.id === part.currentFileId) ?? null;
  const placed = current ? await partEnvelope(partId) : null;
  const fit = await printerFits(placed, part.material);
  const editable = canEdit(access);
  return {
    part,
    access,
    canEdit: editable,
    trail: visibleTrail(info, assemblyId),
    current,
    files,
    instances: instances.map((i) => ({ ...i, next: allowedTargets(i.status, user.role, editable) })),
    events,
    fit: { printers: fit.printers, fits: fit.fits },
    /** Footprint and height as the part will lie on the bed (the chosen orientation, else the file as drawn). */
    placed,
    /** Whether the current mesh is a closed solid, what is wrong in plain words, who accepted it, the repair that made it. */
    health: current ? await currentMeshHealth(partId) : null,
    beds: fit.beds,
  };
}

export type PartDetail = Awaited<ReturnType<typeof getPartDetail>>;

/** One row per part across every assembly the member owns or has been shared. */
export async function listMyParts(user: SessionUser) {
  const d = db();
  const own = await d.select({ id: assemblies.id }).from(assemblies).where(eq(assemblies.ownerId, user.id));
  const sharedRoots = await d.select({ id: assemblyShares.assemblyId }).from(assemblyShares).where(eq(assemblyShares.userId, user.id));
  const ids = new Set(own.map((r) => r.id));
  for (const s of sharedRoots) {
    const info = await accessTo(user, s.id);
    for (const id of subtreeIds(info.tree, s.id)) ids.add(id);
  }
  if (ids.size === 0) return [];
  const rows = await d
    .select({ ...partColumns, assemblyName: assemblies.name })
    .from(parts)
    .innerJoin(assemblies, eq(assemblies.id, parts.assemblyId))
    .where(inArray(parts.assemblyId, [...ids]))
    .orderBy(asc(parts.name));
  const inst = rows.length
    ? await d.select({ partId: partInstances.partId, status: partInstances.status, reprints: partInstances.reprints }).from(partInstances).where(inArray(partInstances.partId, rows.map((r) => r.id)))
    : [];
  return rows.map((r) => {
    const mine = inst.filter((i) => i.partId === r.id);
    return { ...r, statuses: mine.map((i) => i.status), reprints: mine.reduce((s, i) => s + i.reprints, 0) };
  });
}

export type MyPartRow = Awaited<ReturnType<typeof listMyParts>>[number];

/** The assembly page: its tree below it, parts and items, progress per node and what blocks it. */
export async function getAssemblyDetail(user: SessionUser, id: number) {
  const info = await accessTo(user, id);
  const d = db();
  const ids = subtreeIds(info.tree, id);
  const [head] = await d
    .select({ id: assemblies.id, name: assemblies.name, description: assemblies.description, targetDate: assemblies.targetDate, version: assemblies.version, ownerName: users.name })
    .from(assemblies)
    .innerJoin(users, eq(users.id, assemblies.ownerId))
    .where(eq(assemblies.id, id));
  if (!head) throw new AppError("not_found", "No such assembly, or it is not shared with you.");
  const partRows = await d
    .select({ ...partColumns, size: sql<unknown>`JSON_EXTRACT(${partFiles.analysis}, '$.size')` })
    .from(parts)
    .leftJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .where(inArray(parts.assemblyId, ids))
    .orderBy(asc(parts.name));
  const inst = partRows.length
    ? await d.select({ partId: partInstances.partId, status: partInstances.status, reprints: partInstances.reprints }).from(partInstances).where(inArray(partInstances.partId, partRows.map((p) => p.id)))
    : [];
  const itemRows = await itemsOf(ids);
  const { beds, envelopes } = await workshopPrinters();
  const placedOf = await partEnvelopes(partRows.map((p) => p.id));
  // A part split into pieces is printed as its pieces: it leaves the quote, the BOM and sending.
  const splitRows = partRows.length
    ? await d.select({ parentId: partSplits.parentPartId, n: sql<number>`COUNT(*)` }).from(partSplits).where(inArray(partSplits.parentPartId, partRows.map((p) => p.id))).groupBy(partSplits.parentPartId)
    : [];
  const splitInto = new Map(splitRows.map((r) => [r.parentId, Number(r.n)]));
  const partsOut = partRows.map((p) => {
    const mine = inst.filter((i) => i.partId === p.id);
    // The driver may hand JSON_EXTRACT back parsed or as text, depending on the column type it reports.
    const size = (typeof p.size === "string" ? JSON.parse(p.size) : p.size ?? null) as [number, number, number] | null;
    const placed = placedOf.get(p.id);
    const fits = placed && beds.length ? fitPrinters(placed, envelopes, materialKeyOf(p.material), p.material).filter((f) => f.fits).length : null;
    const { size: _s, ...rest } = p;
    return { ...rest, size, placed: placed ?? null, splitInto: splitInto.get(p.id) ?? 0, statuses: mine.map((i) => i.status), reprintsPending: mine.filter((i) => i.reprints > 0 && i.status !== "printed" && i.status !== "accepted").length, fittingPrinters: fits };
  });
  const nodeIds = (n: number) => new Set(subtreeIds(info.tree, n));
  const nodes = ids.map((n) => {
    const node = info.tree.find((t) => t.id === n)!;
    const under = nodeIds(n);
    const sts = partsOut.filter((p) => under.has(p.assemblyId)).flatMap((p) => p.statuses);
    return { id: n, parentId: n === id ? null : node.parentId, name: node.name, needed: sts.length, done: sts.filter((s) => s === "accepted").length };
  });
  const blockers = {
    failed: partsOut.filter((p) => p.reprintsPending > 0).map((p) => ({ id: p.id, name: p.name, count: p.reprintsPending })),
    notUploaded: partsOut.filter((p) => p.currentFileId === null && !p.splitInto).map((p) => ({ id: p.id, name: p.name })),
    notFitting: partsOut.filter((p) => p.fittingPrinters === 0 && !p.splitInto).map((p) => ({ id: p.id, name: p.name })),
    hardwareNotInHand: itemRows.filter((i) => i.status !== "in_hand").map((i) => ({ id: i.id, name: i.name, status: i.status })),
  };
  return {
    assembly: head,
    access: info.access,
    canEdit: canEdit(info.access),
    trail: visibleTrail(info, id),
    nodes,
    parts: partsOut,
    items: itemRows,
    blockers,
    printers: beds.length,
    shares: await listShares(user, id),
  };
}

export type AssemblyDetail = Awaited<ReturnType<typeof getAssemblyDetail>>;

// The bill of materials CSV lives in ./bom; re-exported here for its callers.
export { bomCsv } from "./bom";
