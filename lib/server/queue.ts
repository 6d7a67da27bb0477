import "server-only";
import { and, asc, desc, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { assemblies, materials, partFiles, partInstances, parts, plannerState, plateItems, plates, printers, queueEntries, spools, users } from "@/db/schema";
import { MATERIALS } from "@/lib/estimate";
import { can } from "@/lib/permissions";
import { housingAllows, needsEnclosure } from "@/lib/plan/rules";
import { fitVerdict } from "@/lib/rules/fit";
import { meshIsSound, meshSendCheck, type HealthFigures } from "@/lib/rules/mesh-health";
import { planWorkshop } from "@/lib/plan/plan";
import type { PlanMetrics } from "@/lib/plan/schema";
import { MEMBER_MAX_PRIORITY, type QueuePriorityInput, type QueueSendInput } from "@/lib/validation/queue";
import { AppError } from "./errors";
import { piecesInsideOf } from "./mesh-health";
import { SPOOL_MARGIN } from "./materials";
import { partAccess, requirePartEdit } from "./parts";
import { effectiveGeometry, isSplit, jsonOf } from "./orientation";
import { buildPlanningInput, densities, densityOf, estimateInstance, instanceGeometry, materialKeyOf, planPrinterShapes, timingPrinter, type PartForEstimate } from "./planner";
import { currentPricing, makeQuote, moveInstances, plateLabel, spoolChangeColumns } from "./plates";
import { normColour, workshopSpools } from "./spool-stock";
import type { SessionUser } from "./session";

const invalid = (message: string, field: string) => new AppError("invalid", message, { [field]: [message] });

/**
 * A member sends copies of a part to the workshop. Each is checked before it is accepted: the part
 * has a mesh, some printer takes its material and holds its footprint and height, and a spool of
 * that material holds at least one copy with spare. Copies not yet in the workshop go first, ready before drafted.
 */
export async function sendToQueue(user: SessionUser, input: QueueSendInput): Promise<{ queued: number; instanceIds: number[]; printers: string[]; gramsEach: number; minutesEach: number; waitingFor: string | null }> {
  if (!can(user.role, "queue:send")) throw new AppError("forbidden", "Members send their parts to the workshop; the workshop plans them.");
  await requirePartEdit(user, input.partId);
  if (input.priority > MEMBER_MAX_PRIORITY) throw invalid("Members may ask for normal or soon; the workshop sets rush priorities.", "priority");
  const [part] = await db()
    .select({ name: parts.name, material: parts.material, colour: parts.colour, layerHeightMm: parts.layerHeightMm, walls: parts.walls, infillPercent: parts.infillPercent, ownerId: assemblies.ownerId, fileId: partFiles.id, sizeX: partFiles.sizeX, sizeY: partFiles.sizeY, sizeZ: partFiles.sizeZ, analysis: partFiles.analysis, acceptedBrokenBy: partFiles.acceptedBrokenBy, sha256: partFiles.sha256, units: partFiles.units })
    .from(parts)
    .innerJoin(assemblies, eq(assemblies.id, parts.assemblyId))
    .leftJoin(partFiles, eq(partFiles.id, parts.currentFileId))
    .where(eq(parts.id, input.partId));
  if (!part) throw new AppError("not_found", "No such part, or it is not shared with you.");
  if (await isSplit(input.partId)) throw invalid("This part was split into pieces: send the pieces instead.", "partId");
  if (part.fileId === null || part.sizeX === null || part.sizeY === null || part.sizeZ === null) throw invalid("This part has no mesh yet: upload one before sending it to the workshop.", "partId");
  // A mesh that is not a closed solid is not sent, unless an operator accepted it (lib/rules/mesh-health).
  const figures = jsonOf<HealthFigures>(part.analysis);
  const inside = meshIsSound(figures) ? await piecesInsideOf({ fileId: part.fileId, sha256: part.sha256!, units: part.units! }) : 0;
  const health = meshSendCheck(figures, part.acceptedBrokenBy === null ? null : String(part.acceptedBrokenBy), inside);
  if (!health.ok) throw invalid(health.reason, "partId");
  const type = materialKeyOf(part.material);
  // The member's chosen orientation for the current file decides how the part lies on the bed.
  const geo = instanceGeometry({ sizeX: part.sizeX, sizeY: part.sizeY, sizeZ: part.sizeZ }, await effectiveGeometry(input.partId));
  const { all, shapes } = await planPrinterShapes();
  const takers = type ? shapes.filter((p) => p.materials.includes(type)) : [];
  if (type && needsEnclosure(type) && takers.length && !takers.some((p) => housingAllows(p, type))) {
    throw invalid(`${MATERIALS[type].name} gives off fumes and warps in drafts: it is printed only on an enclosed printer, and no printer here that takes it is marked enclosed.`, "partId");
  }
  // The workshop's one fit rule (lib/rules/fit), the same the part page, quote and orientation panel ask,
  // on the printers whose housing allows the material.
  const check = fitVerdict(geo, type && takers.length ? shapes.filter((p) => housingAllows(p, type)) : shapes, type, part.material);
  if (!check.ok) {
    const hint = type ? "" : ` (it prints ${Object.values(MATERIALS).map((m) => m.name).join(", ")})`;
    throw invalid(`No printer here can take this part: ${check.reason}${hint}.`, "partId");
  }
  if (!type) throw invalid(`The workshop does not print ${part.material}.`, "partId");
  const able = all.filter((p) => check.printers.includes(String(p.id)));
  const est = estimateInstance({ ...part, sizeZ: geo.height, analysis: (part.analysis ?? {}) as PartForEstimate["analysis"] }, timingPrinter(able, type)!, densityOf(await densities(), type));
  const [stock] = await db().select({ grams: sql<number | null>`MAX(${spools.gramsRemaining})` }).from(spools).innerJoin(materials, eq(materials.id, spools.materialId)).where(eq(materials.type, type));
  const need = est.grams * SPOOL_MARGIN;
  if (Number(stock?.grams ?? 0) < need) throw invalid(`The workshop has no ${MATERIALS[type].name} spool holding the ${Math.ceil(need)} g one copy needs. Ask the workshop to stock it.`, "partId");
  // A missing colour is a matter of stock, not of the part: the copies are accepted and wait in the
  // queue with that reason until a spool of the colour is stocked (the plan says so); the member is told now.
  const colour = normColour(part.colour);
  const colourStocked = colour === "any" || (await workshopSpools()).some((s) => s.type === type && s.colour === colour);
  const waitingFor = colourStocked ? null : `The workshop has no ${MATERIALS[type].name} ${part.colour.trim()} spool yet: the copies wait in the queue until one is stocked.`;
  const ids = await db().transaction(async (tx) => {
    const free = await tx
      .select({ id: partInstances.id, status: partInstances.status })
      .from(partInstances)
      .where(and(eq(partInstances.partId, input.partId), inArray(partInstances.status, ["ready", "drafted"])))
      .orderBy(desc(sql`${partInstances.status} = 'ready'`), asc(partInstances.copyNo))
      .for("update");
    if (free.length < input.quantity) throw invalid(free.length ? `Only ${free.length} of this part's copies are not yet in the workshop.` : "Every copy of this part is already in the workshop.", "quantity");
    const take = free.slice(0, input.quantity);
    const ready = take.filter((t) => t.status === "ready").map((t) => t.id);
    const drafted = take.filter((t) => t.status === "drafted").map((t) => t.id);
    await moveInstances(tx, ready, "ready", ["queued"], user.id, "Sent to the workshop");
    await moveInstances(tx, drafted, "drafted", ["ready", "queued"], user.id, "Sent to the workshop");
    const rows = take.map((t) => ({ instanceId: t.id, memberId: part.ownerId, sentBy: user.id, wishedDate: input.wishedDate, priority: input.priority }));
    await tx.insert(queueEntries).values(rows).onDuplicateKeyUpdate({ set: { wishedDate: input.wishedDate, priority: input.priority, sentBy: user.id, sentAt: new Date(), version: sql`${queueEntries.version} + 1` } });
    return take.map((t) => t.id);
  });
  return { queued: ids.length, instanceIds: ids, printers: able.map((p) => p.name), gramsEach: est.grams, minutesEach: est.minutes, waitingFor };
}

interface Unplaced {
  instanceId: number;
  reason: string;
}

async function lastRun() {
  const [s] = await db().select({ at: plannerState.lastRunAt, metrics: plannerState.lastMetrics, unplaced: plannerState.unplaced }).from(plannerState).where(eq(plannerState.id, 1));
  return { at: s?.at ?? null, metrics: (s?.metrics ?? null) as PlanMetrics | null, unplaced: (s?.unplaced ?? []) as Unplaced[] };
}

/** The waiting list: queued copies not on any plate, with the last plan's reason when it left them out. */
export async function listWaiting(user: SessionUser) {
  if (!can(user.role, "queue:manage")) throw new AppError("forbidden", "Only operators and admins see the whole queue.");
  const rows = await db()
    .select({ entryId: queueEntries.id, version: queueEntries.version, instanceId: partInstances.id, copyNo: partInstances.copyNo, reprints: partInstances.reprints, partId: parts.id, partName: parts.name, material: parts.material, colour: parts.colour, member: users.name, priority: queueEntries.priority, wishedDate: queueEntries.wishedDate, sentAt: queueEntries.sentAt })
    .from(queueEntries)
    .innerJoin(partInstances, eq(partInstances.id, queueEntries.instanceId))
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .innerJoin(users, eq(users.id, queueEntries.memberId))
    .where(eq(partInstances.status, "queued"))
    .orderBy(desc(queueEntries.priority), asc(queueEntries.sentAt), asc(partInstances.id));
  const run = await lastRun();
  const why = new Map(run.unplaced.map((u) => [u.instanceId, u.reason]));
  return { lastRunAt: run.at, metrics: run.metrics, waiting: rows.map((r) => ({ ...r, reason: why.get(r.instanceId) ?? null })) };
}

export async function setPriority(user: SessionUser, entryId: number, input: QueuePriorityInput): Promise<{ version: number }> {
  if (!can(user.role, "queue:manage")) throw new AppError("forbidden", "Only operators and admins change priorities.");
  const [res] = await db()
    .update(queueEntries)
    .set({ priority: input.priority, version: sql`${queueEntries.version} + 1` })
    .where(and(eq(queueEntries.id, entryId), eq(queueEntries.version, input.version)));
  if (res.affectedRows === 0) {
    const [e] = await db().select({ id: queueEntries.id }).from(queueEntries).where(eq(queueEntries.id, entryId));
    if (!e) throw new AppError("not_found", "There is no such queue entry.");
    throw new AppError("conflict", "Someone changed this entry since you opened it. Reload to see its priority.");
  }
  return { version: input.version + 1 };
}

type ReplanResult = { plates: number; placed: number; unplaced: Unplaced[]; metrics: PlanMetrics };

/** This process's re-plans: the one running (or last run) and the one waiting behind it, if any. */
const replans = ((globalThis as unknown as { __pwReplans?: { tail: Promise<unknown>; waiting: Promise<ReplanResult> | null } }).__pwReplans ??= { tail: Promise.resolve(), waiting: null });

/**
 * Re-plan: plates that have not started are dropped and everything queued or on them is planned
 * again with lib/plan. Re-plans queue in this process without holding a database connection: one
 * runs at a time, and every request arriving while one runs shares the single run queued behind it
 * (it starts after they arrived, so it plans what each of them would have). The planner row lock
 * still serialises runs across processes; the unique active-instance index makes a second live
 * plate for any instance impossible even so.
 */
export async function replan(user: SessionUser, now = new Date()): Promise<ReplanResult> {
  if (!can(user.role, "queue:manage")) throw new AppError("forbidden", "Only operators and admins re-plan.");
  if (replans.waiting) return replans.waiting;
  const run = replans.tail.then(
    () => undefined,
    () => undefined,
  ).then(() => {
    replans.waiting = null;
    return replanNow(user, now);
  });
  replans.waiting = run;
  replans.tail = run;
  return run;
}

async function replanNow(user: SessionUser, now: Date): Promise<ReplanResult> {
  await db().insert(plannerState).ignore().values({ id: 1 });
  return db().transaction(async (tx) => {
    await tx.select({ id: plannerState.id }).from(plannerState).where(eq(plannerState.id, 1)).for("update");
    const old = await tx.select({ id: plates.id }).from(plates).where(eq(plates.status, "planned")).for("update");
    const oldIds = old.map((o) => o.id);
    const wasPlated = new Set(oldIds.length ? (await tx.select({ i: plateItems.instanceId }).from(plateItems).where(inArray(plateItems.plateId, oldIds))).map((r) => r.i) : []);
    if (oldIds.length) await tx.delete(plates).where(inArray(plates.id, oldIds));
    const input = await buildPlanningInput(tx, now);
    if ("error" in input) throw new AppError("invalid", input.error);
    const out = planWorkshop(input.instance);
    const byKey = new Map(input.queue.map((q) => [q.key, q]));
    const nowPlated = new Set<number>();
    for (const plate of out.plates) {
      const printerId = Number(plate.printer);
      const its = plate.items.map((it) => ({ it, q: byKey.get(it.part)! }));
      const price = await currentPricing(tx, printerId, its[0]!.q.type);
      const quote = makeQuote(its.map(({ q }) => ({ instanceId: q.instanceId, memberId: q.memberId, grams: q.grams, minutes: q.minutes })), price.printer, price.material, price.feeCents, price.currency);
      const [res] = await tx
        .insert(plates)
        .values({ printerId, material: plate.material, colour: plate.color, plannedStart: new Date(plate.start), plannedEnd: new Date(plate.end), runsUnattended: plate.runs_unattended ? 1 : 0, caution: plate.caution, ...spoolChangeColumns(plate.spool_change), estimatedMinutes: quote.totalMinutes, estimatedGrams: quote.totalGrams, quote, quotedAt: now })
        .$returningId();
      const plateId = res!.id;
      await tx.insert(plateItems).values(its.map(({ it, q }) => ({ plateId, instanceId: q.instanceId, activeInstanceId: q.instanceId, memberId: q.memberId, x: it.x, y: it.y, rotated: it.rotated ? 1 : 0, sizeX: q.sizeX, sizeY: q.sizeY, sizeZ: q.sizeZ, minutes: q.minutes, grams: q.grams, fileId: q.fileId })));
      const fresh = its.map(({ q }) => q.instanceId).filter((i) => !wasPlated.has(i));
      await moveInstances(tx, fresh, "queued", ["plated"], user.id, `Planned on ${plateLabel(plateId)}`);
      for (const { q } of its) nowPlated.add(q.instanceId);
    }
    const dropped = [...wasPlated].filter((i) => !nowPlated.has(i));
    await moveInstances(tx, dropped, "plated", ["queued"], user.id, "Re-planned: waiting for a later plate");
    const unplaced: Unplaced[] = [...input.refused, ...out.unplaced.map((u) => ({ instanceId: byKey.get(u.part)!.instanceId, reason: u.reason }))];
    await tx.update(plannerState).set({ lastRunAt: now, lastRunBy: user.id, lastMetrics: out.metrics, unplaced }).where(eq(plannerState.id, 1));
    return { plates: out.plates.length, placed: nowPlated.size, unplaced, metrics: out.metrics };
  });
}

/**
 * For the member's part page: each copy's queue details, the plate it is on and its expected
 * finish, and where a printed copy waits. Anyone who may read the part may see it.
 */
export async function partSchedule(user: SessionUser, partId: number) {
  await partAccess(user, partId);
  const d = db();
  const inst = await d
    .select({ instanceId: partInstances.id, copyNo: partInstances.copyNo, status: partInstances.status, reprints: partInstances.reprints, priority: queueEntries.priority, wishedDate: queueEntries.wishedDate })
    .from(partInstances)
    .leftJoin(queueEntries, eq(queueEntries.instanceId, partInstances.id))
    .where(eq(partInstances.partId, partId))
    .orderBy(asc(partInstances.copyNo));
  const ids = inst.map((i) => i.instanceId);
  const onPlates = ids.length
    ? await d
        .select({ instanceId: plateItems.instanceId, active: plateItems.activeInstanceId, plateId: plates.id, status: plates.status, plannedEnd: plates.plannedEnd, endedAt: plates.endedAt, shelfLabel: plates.shelfLabel, runsUnattended: plates.runsUnattended, printer: printers.name })
        .from(plateItems)
        .innerJoin(plates, eq(plates.id, plateItems.plateId))
        .innerJoin(printers, eq(printers.id, plates.printerId))
        .where(inArray(plateItems.instanceId, ids))
        .orderBy(desc(plates.id))
    : [];
  return inst.map((i) => {
    const live = onPlates.find((p) => p.instanceId === i.instanceId && p.active !== null);
    const done = onPlates.find((p) => p.instanceId === i.instanceId && p.status === "finished");
    return {
      ...i,
      plateId: live?.plateId ?? done?.plateId ?? null,
      printer: live?.printer ?? done?.printer ?? null,
      expectedFinish: live ? live.plannedEnd : null,
      finishedAt: !live && done ? done.endedAt : null,
      shelfLabel: !live && done && (i.status === "printed" || i.status === "accepted") ? done.shelfLabel : null,
      runsUnattended: live ? live.runsUnattended === 1 : false,
    };
  });
}

export type PartScheduleRow = Awaited<ReturnType<typeof partSchedule>>[number];

// The Floor board lives in ./floor-board (one statement for the whole board); re-exported here for its callers.
export { floorBoard, type FloorBoard } from "./floor-board";
