// Invitations and password resets: tokens stored only as SHA-256 (FIPS 180-4; checked against
// node:crypto), single use, expiry, admin-only, and no changing one's own role.
import { createHash } from "node:crypto";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { invitations, mailOutbox, passwordResets, users, workshopSettings } from "@/db/schema";
import { acceptInvitation, createInvitation, hashToken, invitationState, updatePerson } from "@/lib/server/invitations";
import { confirmPasswordReset, requestPasswordReset, resetState } from "@/lib/server/password-reset";
import type { SessionUser } from "@/lib/server/session";

let admin: SessionUser;
let member: SessionUser;
const stamp = Date.now();

async function tokenFromOutbox(to: string, path: "invite" | "reset"): Promise<string> {
  const rows = await db().select({ text: mailOutbox.textBody }).from(mailOutbox).where(eq(mailOutbox.toAddress, to));
  const text = rows.at(-1)?.text ?? "";
  const m = new RegExp(`/${path}/([A-Za-z0-9_-]{43})`).exec(text);
  if (!m?.[1]) throw new Error(`no ${path} link in ${text}`);
  return m[1];
}

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Kettle Lane Workshop", currency: "EUR" });
  const [a] = await db().insert(users).values({ email: `inv-admin-${stamp}@kettlelane.example`, name: "Hana Admin", passwordHash: "x", role: "admin" }).$returningId();
  const [m] = await db().insert(users).values({ email: `inv-member-${stamp}@kettlelane.example`, name: "Luca Member", passwordHash: await bcrypt.hash("old-password-123", 4), role: "member" }).$returningId();
  admin = { id: a!.id, email: `inv-admin-${stamp}@kettlelane.example`, name: "Hana Admin", role: "admin" };
  member = { id: m!.id, email: `inv-member-${stamp}@kettlelane.example`, name: "Luca Member", role: "member" };
});

afterAll(async () => {
  await closeDb();
});

describe("invitations", () => {
  it("stores only the hash, works once, and creates a member", async () => {
    const email = `guest-${stamp}@kettlelane.example`;
    await createInvitation(admin, { email });
    const token = await tokenFromOutbox(email, "invite");
    expect(hashToken(token)).toBe(createHash("sha256").update(token).digest("hex"));
    const [row] = await db().select({ tokenHash: invitations.tokenHash }).from(invitations).where(eq(invitations.email, email));
    expect(row?.tokenHash).toBe(hashToken(token));
    expect(row?.tokenHash).not.toContain(token);
    expect(await invitationState(token)).toEqual({ state: "valid", email });
    await acceptInvitation({ token, name: "Tess Guest", password: "long-enough-pass" });
    const [u] = await db().select({ role: users.role, hash: users.passwordHash }).from(users).where(eq(users.email, email));
    expect(u?.role).toBe("member");
    expect(await bcrypt.compare("long-enough-pass", u!.hash)).toBe(true);
    await expect(acceptInvitation({ token, name: "Tess Again", password: "long-enough-pass" })).rejects.toThrow(/already used/);
    expect(await invitationState(token)).toEqual({ state: "used" });
  });

  it("refuses an expired link and an address that already has an account", async () => {
    const email = `late-${stamp}@kettlelane.example`;
    await createInvitation(admin, { email }, { ttlHours: -1 });
    const token = await tokenFromOutbox(email, "invite");
    expect(await invitationState(token)).toEqual({ state: "expired" });
    await expect(acceptInvitation({ token, name: "Late", password: "long-enough-pass" })).rejects.toThrow(/expired/);
    await expect(createInvitation(admin, { email: member.email })).rejects.toMatchObject({ code: "conflict" });
  });

  it("lets only admins invite and change people, never themselves", async () => {
    await expect(createInvitation(member, { email: `x-${stamp}@kettlelane.example` })).rejects.toMatchObject({ code: "forbidden" });
    await expect(updatePerson(admin, admin.id, { role: "member" })).rejects.toMatchObject({ code: "forbidden" });
    const changed = await updatePerson(admin, member.id, { active: false });
    expect(changed.active).toBe(false);
    await updatePerson(admin, member.id, { active: true });
  });
});

describe("password reset", () => {
  it("sends a link only for an account, which sets the password once", async () => {
    await requestPasswordReset(`nobody-${stamp}@kettlelane.example`);
    expect(await db().select({ id: mailOutbox.id }).from(mailOutbox).where(eq(mailOutbox.toAddress, `nobody-${stamp}@kettlelane.example`))).toHaveLength(0);
    await requestPasswordReset(member.email);
    const token = await tokenFromOutbox(member.email, "reset");
    expect(await resetState(token)).toEqual({ state: "valid", email: member.email });
    await confirmPasswordReset({ token, password: "brand-new-password" });
    const [u] = await db().select({ hash: users.passwordHash }).from(users).where(eq(users.id, member.id));
    expect(await bcrypt.compare("brand-new-password", u!.hash)).toBe(true);
    await expect(confirmPasswordReset({ token, password: "another-password-1" })).rejects.toThrow(/already used/);
  });

  it("refuses an expired reset link", async () => {
    await requestPasswordReset(member.email);
    const token = await tokenFromOutbox(member.email, "reset");
    await db().update(passwordResets).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(passwordResets.tokenHash, hashToken(token)));
    await expect(confirmPasswordReset({ token, password: "another-password-1" })).rejects.toThrow(/expired/);
  });
});
