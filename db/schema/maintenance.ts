import { sql } from "drizzle-orm";
import { datetime, index, int, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { printers } from "./printers";

/**
 * Past and current spells when a printer was down for maintenance. ends_at is NULL while the
 * printer is still down. Insights count these as "down for maintenance" time.
 */
export const printerMaintenance = mysqlTable(
  "printer_maintenance",
  {
    id: int("id").autoincrement().primaryKey(),
    printerId: int("printer_id")
      .notNull()
      .references(() => printers.id, { onDelete: "cascade" }),
    startsAt: datetime("starts_at", { mode: "date", fsp: 3 }).notNull(),
    endsAt: datetime("ends_at", { mode: "date", fsp: 3 }),
    note: varchar("note", { length: 500 }).notNull().default(""),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("printer_maintenance_printer_idx").on(t.printerId, t.startsAt)],
);
