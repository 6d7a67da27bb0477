// Each integration test file gets a database of its own, migrated from nothing, so files never see
// each other's rows (printers, spools, blobs …) whatever order they run in. Dropped afterwards.
import mysql from "mysql2/promise";
import { afterAll } from "vitest";
import { runMigrations, targetFromEnv } from "../../db/migrate";

const base = process.env.DB_TEST_NAME ?? "platewright_test";
const name = `${base}_f${process.pid}_${Math.random().toString(36).slice(2, 8)}`;
process.env.DB_NAME = name;

const target = targetFromEnv(name);
const { database: _d, ...server } = target;
const conn = await mysql.createConnection(server);
await conn.query(`CREATE DATABASE \`${name}\` CHARACTER SET utf8mb4 COLLATE utf8mb4_unicode_ci`);
await conn.end();
await runMigrations(target);

afterAll(async () => {
  const c = await mysql.createConnection(server);
  await c.query(`DROP DATABASE IF EXISTS \`${name}\``);
  await c.end();
});
