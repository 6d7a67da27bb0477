// Seeds the demo scenario. Idempotent: rows are keyed by natural keys and only inserted when missing.
import bcrypt from "bcryptjs";
import { drizzle } from "drizzle-orm/mysql2";
import mysql from "mysql2/promise";
import { fileURLToPath } from "node:url";
import * as schema from "./schema";
import { demoUsers, demoWorkshop } from "./seed-data";
import { seedPrinters } from "./seed/printers";
import { targetFromEnv, type DbTarget } from "./migrate";
import { seedAssemblies } from "./seed/assemblies";
import { seedPlates } from "./seed/plates";
import { seedLedger } from "./seed/ledger";
import { seedHistory } from "./seed/history";

export async function seed(target: DbTarget): Promise<{ usersAdded: number }> {
  const conn = await mysql.createConnection(target);
  try {
    const d = drizzle(conn, { schema, mode: "default" });
    await d.insert(schema.workshopSettings).ignore().values(demoWorkshop);
    let usersAdded = 0;
    for (const u of demoUsers) {
      const hash = await bcrypt.hash(u.password, 10);
      const [res] = await d
        .insert(schema.users)
        .ignore()
        .values({ email: u.email, name: u.name, role: u.role, passwordHash: hash });
      usersAdded += res.affectedRows;
    }
    await seedPrinters(d);
    await seedAssemblies(d);
    await seedPlates(d);
    await seedLedger(d);
    await seedHistory(d);
    return { usersAdded };
  } finally {
    await conn.end();
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  seed(targetFromEnv())
    .then((r) => console.log(`seed: done (${r.usersAdded} demo accounts added)`))
    .catch((e: unknown) => {
      console.error("seed: failed:", e instanceof Error ? e.message : e);
      process.exit(1);
    });
}
