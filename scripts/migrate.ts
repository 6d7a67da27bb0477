// Applies the committed migrations to $DB_NAME (default platewright).
import { runMigrations, targetFromEnv } from "../db/migrate";

const target = targetFromEnv();
runMigrations(target)
  .then(() => console.log(`migrate: ${target.database} is up to date`))
  .catch((e: unknown) => {
    console.error("migrate: failed:", e instanceof Error ? e.message : e);
    process.exit(1);
  });
