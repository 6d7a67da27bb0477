import mysql from "mysql2/promise";
import { afterAll, describe, expect, it } from "vitest";
import { runMigrations } from "../../db/migrate";
import { seed } from "../../db/seed";
import { demoUsers } from "../../db/seed-data";
import { closeDb } from "@/db";
import { testTarget } from "./global-setup";

const scratch = { ...testTarget(), database: `${testTarget().database}_scratch` };

async function query<T>(sql: string, target = scratch): Promise<T[]> {
  const conn = await mysql.createConnection(target);
  try {
    const [rows] = await conn.query(sql);
    return rows as T[];
  } finally {
    await conn.end();
  }
}

afterAll(async () => {
  const { database, ...server } = scratch;
  const conn = await mysql.createConnection(server);
  await conn.query(`DROP DATABASE IF EXISTS \`${database}\``);
  await conn.end();
  await closeDb();
});

describe("migrations and seed", () => {
  it("apply on an empty database and create every table", async () => {
    const { database, ...server } = scratch;
    const conn = await mysql.createConnection(server);
    await conn.query(`DROP DATABASE IF EXISTS \`${database}\``);
    await conn.query(`CREATE DATABASE \`${database}\``);
    await conn.end();
    await runMigrations(scratch);
    const tables = (await query<{ t: string }>(`SELECT table_name AS t FROM information_schema.tables WHERE table_schema = '${database}'`)).map((r) => r.t);
    expect(tables).toEqual(expect.arrayContaining(["users", "workshop_settings", "sign_in_throttle", "__drizzle_migrations"]));
    // A second run finds nothing to do and changes nothing.
    const before = await query<{ n: number }>("SELECT COUNT(*) AS n FROM __drizzle_migrations");
    await runMigrations(scratch);
    const after = await query<{ n: number }>("SELECT COUNT(*) AS n FROM __drizzle_migrations");
    expect(after[0]?.n).toBe(before[0]?.n);
  });

  it("seeds the demo scenario twice without duplicating anything", async () => {
    const first = await seed(scratch);
    expect(first.usersAdded).toBeGreaterThanOrEqual(demoUsers.length);
    const counts = async () => ({
      users: (await query<{ n: number }>("SELECT COUNT(*) AS n FROM users"))[0]?.n,
      workshops: (await query<{ n: number }>("SELECT COUNT(*) AS n FROM workshop_settings"))[0]?.n,
    });
    const once = await counts();
    const second = await seed(scratch);
    expect(second.usersAdded).toBe(0);
    expect(await counts()).toEqual(once);
    expect(once.workshops).toBe(1);
    expect(once.users).toBeGreaterThanOrEqual(demoUsers.length);
  });

  it("stores passwords only as bcrypt hashes", async () => {
    const rows = await query<{ email: string; password_hash: string }>("SELECT email, password_hash FROM users");
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) {
      expect(r.password_hash).toMatch(/^\$2[aby]\$\d\d\$/);
      const plain = demoUsers.find((u) => u.email === r.email)?.password;
      if (plain) {
        expect(r.password_hash).toMatch(/^\$2[aby]\$10\$/); // sign-in accounts: cost 10
        expect(r.password_hash).not.toContain(plain);
      }
    }
  });
});
