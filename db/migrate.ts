import { drizzle } from "drizzle-orm/mysql2";
import { migrate } from "drizzle-orm/mysql2/migrator";
import mysql from "mysql2/promise";
import path from "node:path";

export interface DbTarget {
  host: string;
  port: number;
  user: string;
  password: string;
  database: string;
}

export function targetFromEnv(database = process.env.DB_NAME ?? "platewright"): DbTarget {
  return {
    host: process.env.DB_HOST ?? "127.0.0.1",
    port: Number(process.env.DB_PORT ?? 3307),
    user: process.env.DB_USER ?? "app",
    password: process.env.DB_PASSWORD ?? "platewright-dev",
    database,
  };
}

/** Applies every committed migration in drizzle/ that the database has not seen yet. */
export async function runMigrations(target: DbTarget): Promise<void> {
  const conn = await mysql.createConnection({ ...target, multipleStatements: true });
  try {
    await migrate(drizzle(conn), { migrationsFolder: path.join(process.cwd(), "drizzle") });
  } finally {
    await conn.end();
  }
}
