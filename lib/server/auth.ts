import "server-only";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { db } from "@/db";
import { users, type Role } from "@/db/schema";
import { clientAddress } from "./client-address";
import { dbErrorKind } from "./errors";
import { endAllSessions, sessionVersionOf } from "./session-version";
import { clearFailures, takeAttempt } from "./throttle";

const credentialsSchema = z.object({
  email: z.string().trim().toLowerCase().email().max(254),
  password: z.string().min(1).max(200),
});

// A hash to compare against when the account does not exist, so both paths take the same time.
const DUMMY_HASH = "$2b$10$8pi7K.Z5fbUFmro/4qKANe9heHsuoeb9ElPeGszeaOezM4IXuGUHG";

/** A refusal whose message is meant for the person signing in. */
class SignInRefused extends Error {}

/** Checks e-mail and password under the throttle; the account for the session, or a SignInRefused. */
async function checkCredentials(raw: unknown, headers: Record<string, unknown> | undefined) {
  const parsed = credentialsSchema.safeParse(raw);
  if (!parsed.success) throw new SignInRefused("Enter your e-mail address and password.");
  const { email, password } = parsed.data;
  const keys = [`account:${email}`, `address:${clientAddress(headers)}`];
  // Each attempt is counted before its password is checked (atomically), so parallel guesses
  // cannot all pass the check before the first of them is recorded.
  for (const key of keys) {
    const wait = await takeAttempt(key);
    if (wait > 0) throw new SignInRefused(`Too many failed attempts. Try again in ${wait} s.`);
  }
  const [user] = await db().select().from(users).where(eq(users.email, email)).limit(1);
  const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
  if (!user || !ok || !user.active) throw new SignInRefused("That e-mail address and password do not match an account.");
  await Promise.all(keys.map((k) => clearFailures(k)));
  return { id: String(user.id), email: user.email, name: user.name, role: user.role, sessionVersion: user.sessionVersion };
}

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(raw, req) {
        try {
          return await checkCredentials(raw, req?.headers);
        } catch (e) {
          // next-auth shows the message on the form: ours are written for people; anything else
          // (a database error carries its SQL text) becomes plain words.
          if (e instanceof SignInRefused) throw e;
          const kind = dbErrorKind(e);
          if (kind !== "down") console.error("[platewright] sign-in failed", e);
          throw new Error(kind === "down" ? "Signing in is not possible right now: the database is not reachable. Try again shortly." : "Signing in failed on our side. Try again shortly.");
        }
      },
    }),
  ],
  events: {
    // Signing out ends every session of the account (a JWT cannot be revoked one by one).
    async signOut({ token }) {
      const uid = Number(token?.uid);
      if (Number.isInteger(uid) && uid > 0) await endAllSessions(uid);
    },
  },
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = (user as { role?: Role }).role;
        token.sv = (user as { sessionVersion?: number }).sessionVersion ?? 0;
        return token;
      }
      // next-auth's own session endpoint: a session that was ended is refused there too (it then
      // clears the cookie). Server code checks the version itself on every request (currentUser).
      const uid = Number(token.uid);
      if (!Number.isInteger(uid) || (await sessionVersionOf(uid)) !== token.sv) throw new Error("This session has ended.");
      return token;
    },
    async session({ session, token }) {
      if (session.user) {
        session.user.id = token.uid as number;
        session.user.role = token.role as Role;
      }
      return session;
    },
  },
};
