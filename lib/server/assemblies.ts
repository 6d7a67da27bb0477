import "server-only";
import { and, eq, inArray, sql } from "drizzle-orm";
import { db } from "@/db";
import { assemblies, assemblyShares, items, partInstances, parts, users, type ShareAccess } from "@/db/schema";
import type { AssemblyInput, AssemblyPatch, ItemInput, ItemPatch, ShareInput } from "@/lib/validation/assemblies";
import { AppError } from "./errors";
import type { SessionUser } from "./session";

/** What a person may do with an assembly (and everything below it). */
export type Access = "owner" | "edit" | "read" | "workshop";

export interface TreeNode {
  id: number;
  parentId: number | null;
  name: string;
  ownerId: number;
}

export interface AccessInfo {
  access: Access;
  rootId: number;
  ownerId: number;
  /** The whole tree the assembly belongs to, for ancestors and subtrees. */
  tree: TreeNode[];
  /** For access through a share: the highest shared node; nothing above it is shown to this viewer. */
  sharedTop?: number;
}

export const canEdit = (a: Access) => a === "owner" || a === "edit";

const hidden = () => new AppError("not_found", "No such assembly, or it is not shared with you.");

/** Who may read an assembly: its owner, members it (or an ancestor) is shared with, and the workshop. */
export async function accessTo(user: SessionUser, assemblyId: number): Promise<AccessInfo> {
  const d = db();
  const [row] = await d.select({ rootId: assemblies.rootId, ownerId: assemblies.ownerId }).from(assemblies).where(eq(assemblies.id, assemblyId)).limit(1);
  if (!row) throw hidden();
  const rootId = row.rootId ?? assemblyId;
  const tree = await d
    .select({ id: assemblies.id, parentId: assemblies.parentId, name: assemblies.name, ownerId: assemblies.ownerId })
    .from(assemblies)
    .where(eq(assemblies.rootId, rootId));
  let access: Access | null = null;
  let sharedTop: number | undefined;
  if (row.ownerId === user.id) access = "owner";
  else if (user.role !== "member") access = "workshop";
  else {
    const chain = ancestors(tree, assemblyId).map((n) => n.id);
    const shares = await d
      .select({ access: assemblyShares.access, assemblyId: assemblyShares.assemblyId })
      .from(assemblyShares)
      .where(and(eq(assemblyShares.userId, user.id), inArray(assemblyShares.assemblyId, chain)));
    if (shares.some((s) => s.access === "edit")) access = "edit";
    else if (shares.length) access = "read";
    const shared = new Set(shares.map((s) => s.assemblyId));
    sharedTop = [...chain].reverse().find((n) => shared.has(n));
  }
  if (!access) throw hidden();
  return { access, rootId, ownerId: row.ownerId, tree, sharedTop };
}

/** The breadcrumb to a node, root first, cut at the highest node this viewer was given (a share's parents stay unnamed). */
export function visibleTrail(info: AccessInfo, id: number): { id: number; name: string }[] {
  const up = ancestors(info.tree, id);
  const cut = info.sharedTop === undefined ? up.length : up.findIndex((n) => n.id === info.sharedTop) + 1;
  return up.slice(0, cut > 0 ? cut : 1).reverse().map((n) => ({ id: n.id, name: n.name }));
}

/** Refuses with 403 when the caller may read but not change (they know it exists). */
export async function requireEdit(user: SessionUser, assemblyId: number): Promise<AccessInfo> {
  const a = await accessTo(user, assemblyId);
  if (!canEdit(a.access)) {
    throw new AppError("forbidden", a.access === "workshop" ? "The workshop reads members' assemblies but does not change them." : "This assembly is shared with you to read only.");
  }
  return a;
}

/** The node and its parents, root last. */
export function ancestors(tree: TreeNode[], id: number): TreeNode[] {
  const byId = new Map(tree.map((n) => [n.id, n]));
  const out: TreeNode[] = [];
  let cur = byId.get(id);
  while (cur && out.length <= tree.length) {
    out.push(cur);
    cur = cur.parentId === null ? undefined : byId.get(cur.parentId);
  }
  return out;
}

/** Ids of the node and everything below it. */
export function subtreeIds(tree: TreeNode[], id: number): number[] {
  const out = [id];
  for (let i = 0; i < out.length; i++) for (const n of tree) if (n.parentId === out[i]) out.push(n.id);
  return out;
}

export interface AssemblySummary {
  id: number;
  name: string;
  description: string;
  targetDate: string | null;
  ownerName: string;
  access: Access;
  needed: number;
  done: number;
}

/** The member's own top-level assemblies and everything shared with them. */
export async function listMyAssemblies(user: SessionUser): Promise<AssemblySummary[]> {
  const d = db();
  const cols = { id: assemblies.id, name: assemblies.name, description: assemblies.description, targetDate: assemblies.targetDate, rootId: assemblies.rootId, ownerName: users.name };
  const own = await d.select(cols).from(assemblies).innerJoin(users, eq(users.id, assemblies.ownerId)).where(and(eq(assemblies.ownerId, user.id), sql`${assemblies.parentId} IS NULL`));
  const shared = await d
    .select({ ...cols, access: assemblyShares.access })
    .from(assemblyShares)
    .innerJoin(assemblies, eq(assemblies.id, assemblyShares.assemblyId))
    .innerJoin(users, eq(users.id, assemblies.ownerId))
    .where(eq(assemblyShares.userId, user.id));
  const rows: (Omit<AssemblySummary, "needed" | "done"> & { rootId: number | null })[] = [
    ...own.map((r) => ({ ...r, access: "owner" as Access })),
    ...shared.map((r) => ({ ...r, access: r.access as Access })),
  ];
  const out: AssemblySummary[] = [];
  for (const r of rows) {
    const tree = await d.select({ id: assemblies.id, parentId: assemblies.parentId, name: assemblies.name, ownerId: assemblies.ownerId }).from(assemblies).where(eq(assemblies.rootId, r.rootId ?? r.id));
    const p = await progressOf(subtreeIds(tree, r.id));
    const { rootId: _r, ...rest } = r;
    out.push({ ...rest, ...p });
  }
  return out.sort((a, b) => a.name.localeCompare(b.name));
}

/** Copies needed and copies accepted across some assemblies. */
export async function progressOf(ids: number[]): Promise<{ needed: number; done: number }> {
  if (ids.length === 0) return { needed: 0, done: 0 };
  const [r] = await db()
    .select({ needed: sql<number>`COUNT(*)`, done: sql<number>`COALESCE(SUM(${partInstances.status} = 'accepted'), 0)` })
    .from(partInstances)
    .innerJoin(parts, eq(parts.id, partInstances.partId))
    .where(inArray(parts.assemblyId, ids));
  return { needed: Number(r?.needed ?? 0), done: Number(r?.done ?? 0) };
}

export async function createAssembly(user: SessionUser, input: AssemblyInput): Promise<{ id: number }> {
  if (user.role !== "member") throw new AppError("forbidden", "Assemblies belong to members; the workshop reads them.");
  // The access check reads through the pool, so it runs before the transaction (one connection each).
  const parent = input.parentId ? await requireEdit(user, input.parentId) : null;
  return db().transaction(async (tx) => {
    const rootId: number | null = parent ? parent.rootId : null;
    const ownerId = parent ? parent.ownerId : user.id; // a sub-assembly belongs to the tree's owner, whoever adds it
    const [res] = await tx
      .insert(assemblies)
      .values({ ownerId, parentId: input.parentId ?? null, rootId, name: input.name, description: input.description, targetDate: input.targetDate ?? null })
      .$returningId();
    const id = res!.id;
    if (rootId === null) await tx.update(assemblies).set({ rootId: id }).where(eq(assemblies.id, id));
    return { id };
  });
}

export async function updateAssembly(user: SessionUser, id: number, patch: AssemblyPatch): Promise<{ id: number; version: number }> {
  await requireEdit(user, id);
  const { version, ...values } = patch;
  const [res] = await db()
    .update(assemblies)
    .set({ ...values, version: sql`${assemblies.version} + 1`, updatedAt: new Date() })
    .where(and(eq(assemblies.id, id), eq(assemblies.version, version)));
  if (res.affectedRows === 0) throw new AppError("conflict", "Someone changed this assembly since you opened it. Reload to see their changes.");
  return { id, version: version + 1 };
}

/** Only the owner deletes; the subtree's parts, items and shares go with it. */
export async function deleteAssembly(user: SessionUser, id: number): Promise<void> {
  const a = await accessTo(user, id);
  if (a.access !== "owner") throw new AppError("forbidden", "Only the owner can delete an assembly.");
  const ids = subtreeIds(a.tree, id);
  await db().delete(assemblies).where(inArray(assemblies.id, ids));
}

export interface ShareRow {
  userId: number;
  name: string;
  email: string;
  access: ShareAccess;
}

export async function listShares(user: SessionUser, id: number): Promise<ShareRow[]> {
  const a = await accessTo(user, id);
  if (a.access !== "owner") return [];
  return db()
    .select({ userId: users.id, name: users.name, email: users.email, access: assemblyShares.access })
    .from(assemblyShares)
    .innerJoin(users, eq(users.id, assemblyShares.userId))
    .where(eq(assemblyShares.assemblyId, id));
}

/** Only the owner shares; an edit share does not pass sharing on. */
export async function shareAssembly(user: SessionUser, id: number, input: ShareInput): Promise<ShareRow> {
  const a = await accessTo(user, id);
  if (a.access !== "owner") throw new AppError("forbidden", "Only the owner can share an assembly.");
  const [target] = await db().select({ id: users.id, name: users.name, email: users.email, role: users.role, active: users.active }).from(users).where(eq(users.email, input.email)).limit(1);
  if (!target || !target.active || target.role !== "member") {
    throw new AppError("invalid", "No member has that e-mail address.", { email: ["No member has that e-mail address."] });
  }
  if (target.id === user.id) throw new AppError("invalid", "You own this assembly already.", { email: ["You own this assembly already."] });
  await db().insert(assemblyShares).values({ assemblyId: id, userId: target.id, access: input.access }).onDuplicateKeyUpdate({ set: { access: input.access } });
  return { userId: target.id, name: target.name, email: target.email, access: input.access };
}

export async function unshareAssembly(user: SessionUser, id: number, userId: number): Promise<void> {
  const a = await accessTo(user, id);
  if (a.access !== "owner") throw new AppError("forbidden", "Only the owner can change who an assembly is shared with.");
  await db().delete(assemblyShares).where(and(eq(assemblyShares.assemblyId, id), eq(assemblyShares.userId, userId)));
}

export async function itemsOf(ids: number[]) {
  if (ids.length === 0) return [];
  return db()
    .select({
      id: items.id,
      assemblyId: items.assemblyId,
      kind: items.kind,
      name: items.name,
      quantity: items.quantity,
      source: items.source,
      unitPriceCents: items.unitPriceCents,
      dueDate: items.dueDate,
      status: items.status,
      notes: items.notes,
      version: items.version,
    })
    .from(items)
    .where(inArray(items.assemblyId, ids))
    .orderBy(items.name);
}

export type ItemRow = Awaited<ReturnType<typeof itemsOf>>[number];

export async function itemAssembly(itemId: number): Promise<number> {
  const [row] = await db().select({ assemblyId: items.assemblyId }).from(items).where(eq(items.id, itemId)).limit(1);
  if (!row) throw new AppError("not_found", "No such item.");
  return row.assemblyId;
}

export async function createItem(user: SessionUser, assemblyId: number, input: ItemInput): Promise<{ id: number }> {
  await requireEdit(user, assemblyId);
  const [res] = await db()
    .insert(items)
    .values({ ...input, assemblyId, unitPriceCents: input.unitPriceCents ?? null, dueDate: input.dueDate ?? null })
    .$returningId();
  return { id: res!.id };
}

export async function updateItem(user: SessionUser, itemId: number, patch: ItemPatch): Promise<{ id: number; version: number }> {
  await requireEdit(user, await itemAssembly(itemId).catch(() => { throw new AppError("not_found", "No such item."); }));
  const { version, ...values } = patch;
  const [res] = await db()
    .update(items)
    .set({ ...values, version: sql`${items.version} + 1` })
    .where(and(eq(items.id, itemId), eq(items.version, version)));
  if (res.affectedRows === 0) throw new AppError("conflict", "Someone changed this item since you opened it. Reload to see their changes.");
  return { id: itemId, version: version + 1 };
}

export async function deleteItem(user: SessionUser, itemId: number): Promise<void> {
  await requireEdit(user, await itemAssembly(itemId));
  await db().delete(items).where(eq(items.id, itemId));
}

/** Path ids: anything but a positive integer is simply not found. */
export function parseId(raw: string): number {
  const n = Number(raw);
  if (!Number.isSafeInteger(n) || n <= 0 || String(n) !== raw) throw new AppError("not_found", "Not found.");
  return n;
}
