import { datetime, index, int, mysqlEnum, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";
import { roles } from "../../lib/rules/roles";

// Roles are one of the workshop's rules (lib/rules); re-exported for the schema's importers.
export { roles };
export type { Role } from "../../lib/rules/roles";

export const users = mysqlTable(
  "users",
  {
    id: int("id").autoincrement().primaryKey(),
    email: varchar("email", { length: 254 }).notNull().unique(),
    name: varchar("name", { length: 120 }).notNull(),
    passwordHash: varchar("password_hash", { length: 100 }).notNull(),
    role: mysqlEnum("role", roles).notNull().default("member"),
    active: int("active").notNull().default(1),
    /** Sessions carry the version they were signed in under; bumping it ends every one of them. */
    sessionVersion: int("session_version").notNull().default(0),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    updatedAt: datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("users_role_idx").on(t.role)],
);

export type UserRow = typeof users.$inferSelect;

/** Failed sign-ins per key ("account:<email>" or "address:<ip>"), for slowing down guessing. */
export const signInThrottle = mysqlTable("sign_in_throttle", {
  key: varchar("throttle_key", { length: 300 }).primaryKey(),
  failures: int("failures").notNull().default(0),
  firstFailureAt: datetime("first_failure_at", { mode: "date", fsp: 3 }).notNull(),
  lockedUntil: datetime("locked_until", { mode: "date", fsp: 3 }),
});
