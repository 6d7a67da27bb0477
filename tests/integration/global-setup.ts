// Recreates the integration-test database from nothing and applies every migration, once per run.
// Refuses anything but a loopback server, so a test run can never touch a real database.
import mysql from "mysql2/promise";
import { runMigrations, targetFromEnv } from "../../db/migrate";

export function testTarget() {
  const t = targetFromEnv(process.env.DB_TEST_NAME ?? "platewright_test");
  if (!["127.0.0.1", "localhost", "::1"].includes(t.host)) throw new Error(`integration tests run only against loopback, not ${t.host}`);
  if (!/test/.test(t.database)) throw new Error(`integration tests need a database whose name says test, not ${t.database}`);
  return t;
}

export async function recreateDatabase(t = testTarget()): Promise<void> {
  const { database, ...server } = t;
  const conn = await mysql.createConnection(server);
  try {
    await conn.query(`DROP DATABASE IF EXISTS \`${database}\``);
    await conn.query(`CREATE DATABASE \`${database}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
  } finally {
    await conn.end();
  }
}

export default async function setup(): Promise<void> {
  const t = testTarget();
  await recreateDatabase(t);
  await runMigrations(t);
}
