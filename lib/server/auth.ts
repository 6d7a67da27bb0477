import "server-only";
import bcrypt from "bcryptjs";
import { eq } from "drizzle-orm";
import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { db } from "@/db";
import { users, type Role } from "@/db/schema";
import { clientAddress } from "./client-address";
import { clearFailures, lockedFor, recordFailure } from "./throttle";

const credentialsSchema = z.object({
  email: z.string().trim().toLowerCase().email().max(254),
  password: z.string().min(1).max(200),
});

// A hash to compare against when the account does not exist, so both paths take the same time.
const DUMMY_HASH = "$2b$10$8pi7K.Z5fbUFmro/4qKANe9heHsuoeb9ElPeGszeaOezM4IXuGUHG";

export const authOptions: NextAuthOptions = {
  session: { strategy: "jwt", maxAge: 12 * 60 * 60 },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(raw, req) {
        const parsed = credentialsSchema.safeParse(raw);
        if (!parsed.success) throw new Error("Enter your e-mail address and password.");
        const { email, password } = parsed.data;
        const keys = [`account:${email}`, `address:${clientAddress(req?.headers)}`];
        for (const key of keys) {
          const wait = await lockedFor(key);
          if (wait > 0) throw new Error(`Too many failed attempts. Try again in ${wait} s.`);
        }
        const [user] = await db().select().from(users).where(eq(users.email, email)).limit(1);
        const ok = await bcrypt.compare(password, user?.passwordHash ?? DUMMY_HASH);
        if (!user || !ok || !user.active) {
          await Promise.all(keys.map((k) => recordFailure(k)));
          throw new Error("That e-mail address and password do not match an account.");
        }
        await Promise.all(keys.map((k) => clearFailures(k)));
        return { id: String(user.id), email: user.email, name: user.name, role: user.role };
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.uid = Number(user.id);
        token.role = (user as { role?: Role }).role;
      }
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
