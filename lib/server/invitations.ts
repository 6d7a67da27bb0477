import "server-only";
import bcrypt from "bcryptjs";
import { createHash, randomBytes } from "node:crypto";
import { and, desc, eq, gt, isNull } from "drizzle-orm";
import { db } from "@/db";
import { invitations, users, type Role } from "@/db/schema";
import { env } from "@/lib/env";
import { can } from "@/lib/permissions";
import type { AcceptInviteInput, InviteInput, PersonUpdateInput } from "@/lib/validation/mail";
import { AppError } from "./errors";
import { appUrl, notify } from "./mail";
import type { SessionUser } from "./session";
import { assertPasswordStrong } from "./password-policy";
import { endAllSessions } from "./session-version";

/** 32 random bytes for the link; only their SHA-256 is stored, so a database leak opens no doors. */
export function newToken(): { token: string; hash: string } {
  const token = randomBytes(32).toString("base64url");
  return { token, hash: hashToken(token) };
}

export function hashToken(token: string): string {
  return createHash("sha256").update(token, "utf8").digest("hex");
}

function requireAdmin(user: SessionUser) {
  if (!can(user.role, "people:manage")) throw new AppError("forbidden", "Only an admin manages people.");
}

export interface InvitationRow {
  id: number;
  email: string;
  expiresAt: Date;
  usedAt: Date | null;
  createdAt: Date;
  invitedByName: string | null;
  state: "open" | "joined" | "expired";
}

export async function createInvitation(user: SessionUser, input: InviteInput, opts: { ttlHours?: number } = {}): Promise<{ id: number; email: string; expiresAt: Date }> {
  requireAdmin(user);
  const [existing] = await db().select({ id: users.id }).from(users).where(eq(users.email, input.email)).limit(1);
  if (existing) throw new AppError("conflict", "Someone with that e-mail address already has an account.", { email: ["This address already has an account."] });
  const { token, hash } = newToken();
  const expiresAt = new Date(Date.now() + (opts.ttlHours ?? env().INVITE_TTL_HOURS) * 3_600_000);
  return db().transaction(async (tx) => {
    const [row] = await tx.insert(invitations).values({ email: input.email, tokenHash: hash, invitedBy: user.id, expiresAt }).$returningId();
    if (!row) throw new Error("invitation insert returned no id");
    await notify("invitation", { to: input.email, inviterName: user.name, link: `${appUrl()}/invite/${token}`, expiresAt }, tx);
    return { id: row.id, email: input.email, expiresAt };
  });
}

export async function listInvitations(user: SessionUser): Promise<InvitationRow[]> {
  requireAdmin(user);
  const now = Date.now();
  const rows = await db()
    .select({ id: invitations.id, email: invitations.email, expiresAt: invitations.expiresAt, usedAt: invitations.usedAt, createdAt: invitations.createdAt, invitedByName: users.name })
    .from(invitations)
    .leftJoin(users, eq(users.id, invitations.invitedBy))
    .orderBy(desc(invitations.id))
    .limit(100);
  return rows.map((r) => ({ ...r, state: r.usedAt ? "joined" : r.expiresAt.getTime() <= now ? "expired" : "open" }));
}

export type LinkState = { state: "valid"; email: string } | { state: "used" | "expired" | "unknown" };

/** What the invite page shows before anyone types: the address, or why the link no longer works. */
export async function invitationState(token: string): Promise<LinkState> {
  const [row] = await db()
    .select({ email: invitations.email, expiresAt: invitations.expiresAt, usedAt: invitations.usedAt })
    .from(invitations)
    .where(eq(invitations.tokenHash, hashToken(token)))
    .limit(1);
  if (!row) return { state: "unknown" };
  if (row.usedAt) return { state: "used" };
  if (row.expiresAt.getTime() <= Date.now()) return { state: "expired" };
  return { state: "valid", email: row.email };
}

const refusal: Record<Exclude<LinkState["state"], "valid">, string> = {
  used: "This invitation link was already used. Sign in, or ask an admin for a new invitation.",
  expired: "This invitation link has expired. Ask an admin for a new one.",
  unknown: "This invitation link is not valid. Copy the whole link from the message, or ask for a new one.",
};

/** Sets name and password and creates the member, once: the row is locked and marked used in one transaction. */
export async function acceptInvitation(input: AcceptInviteInput): Promise<{ email: string }> {
  assertPasswordStrong(input.password, [input.name]);
  const passwordHash = await bcrypt.hash(input.password, 10);
  return db().transaction(async (tx) => {
    const [inv] = await tx
      .select({ id: invitations.id, email: invitations.email, expiresAt: invitations.expiresAt, usedAt: invitations.usedAt })
      .from(invitations)
      .where(eq(invitations.tokenHash, hashToken(input.token)))
      .for("update")
      .limit(1);
    const state = !inv ? "unknown" : inv.usedAt ? "used" : inv.expiresAt.getTime() <= Date.now() ? "expired" : "valid";
    if (state !== "valid" || !inv) throw new AppError("conflict", refusal[state === "valid" ? "unknown" : state]);
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, inv.email)).limit(1);
    if (taken) throw new AppError("conflict", "An account with this e-mail address exists already. Sign in instead.");
    const [u] = await tx.insert(users).values({ email: inv.email, name: input.name, passwordHash, role: "member" }).$returningId();
    await tx.update(invitations).set({ usedAt: new Date(), userId: u?.id ?? null }).where(and(eq(invitations.id, inv.id), isNull(invitations.usedAt)));
    return { email: inv.email };
  });
}

// ---- People (admin) ------------------------------------------------------------------------------

export interface PersonRow {
  id: number;
  name: string;
  email: string;
  role: Role;
  active: boolean;
  createdAt: Date;
}

export async function listPeople(user: SessionUser): Promise<PersonRow[]> {
  requireAdmin(user);
  const rows = await db()
    .select({ id: users.id, name: users.name, email: users.email, role: users.role, active: users.active, createdAt: users.createdAt })
    .from(users)
    .orderBy(users.name);
  return rows.map((r) => ({ ...r, active: r.active === 1 }));
}

/** Changes another person's role or active state. Nobody changes their own, so an admin cannot lock the workshop out. */
export async function updatePerson(user: SessionUser, id: number, input: PersonUpdateInput): Promise<PersonRow> {
  requireAdmin(user);
  if (id === user.id) throw new AppError("forbidden", "You cannot change your own role or deactivate yourself; ask another admin.");
  const set: { role?: Role; active?: number; updatedAt: Date } = { updatedAt: new Date() };
  if (input.role) set.role = input.role;
  if (input.active !== undefined) set.active = input.active ? 1 : 0;
  const [res] = await db().update(users).set(set).where(eq(users.id, id));
  if (res.affectedRows === 0) throw new AppError("not_found", "No person with that number.");
  if (input.active === false) await endAllSessions(id); // reactivating later does not revive old sessions
  const person = (await listPeople(user)).find((p) => p.id === id);
  if (!person) throw new AppError("not_found", "No person with that number.");
  return person;
}

/** Open invitations count for the people page. */
export async function openInvitationCount(user: SessionUser): Promise<number> {
  requireAdmin(user);
  const rows = await db().select({ id: invitations.id }).from(invitations).where(and(isNull(invitations.usedAt), gt(invitations.expiresAt, new Date())));
  return rows.length;
}
