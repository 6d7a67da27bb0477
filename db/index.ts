import { drizzle, type MySql2Database } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { watchWrites } from "./change-watch";
import { guardPool, guardTransactions } from "./tx-guard";
import * as schema from "./schema";
import { env } from "@/lib/env";

export type Db = MySql2Database<typeof schema>;

// One pool per process, cached on globalThis so dev reloads do not open a new pool each time.
const g = globalThis as unknown as { __pwPool?: mysql.Pool; __pwDb?: Db };

export function pool(): mysql.Pool {
  if (!g.__pwPool) {
    const e = env();
    // Every write through the pool moves the change counter that read caches check (db/change-watch.ts).
    // A pool call from inside a transaction is refused (db/tx-guard.ts): pass the transaction down.
    g.__pwPool = guardPool(watchWrites(mysql.createPool({
      host: e.DB_HOST,
      port: e.DB_PORT,
      user: e.DB_USER,
      password: e.DB_PASSWORD,
      database: e.DB_NAME,
      connectionLimit: e.DB_POOL_SIZE,
      waitForConnections: true,
      enableKeepAlive: true,
      timezone: "Z",
      dateStrings: false,
    })));
  }
  return g.__pwPool;
}

export function db(): Db {
  if (!g.__pwDb) g.__pwDb = guardTransactions(drizzle(pool(), { schema, mode: "default" }));
  return g.__pwDb;
}

export async function closeDb(): Promise<void> {
  const p = g.__pwPool;
  g.__pwPool = undefined;
  g.__pwDb = undefined;
  if (p) await p.end();
}

export { schema };
