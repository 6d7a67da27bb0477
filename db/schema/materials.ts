import { datetime, double, index, int, mysqlEnum, mysqlTable, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";
import { materialTypes, printers } from "./printers";

/** A material the workshop sells by weight: one family, one price, its density and where that came from. */
export const materials = mysqlTable(
  "materials",
  {
    id: int("id").autoincrement().primaryKey(),
    name: varchar("name", { length: 80 }).notNull().unique(),
    type: mysqlEnum("type", materialTypes).notNull(),
    densityGcm3: double("density_g_cm3").notNull(),
    densitySource: varchar("density_source", { length: 200 }).notNull(),
    pricePerKgCents: int("price_per_kg_cents").notNull(),
    /** A spool under this many grams counts as low stock. */
    lowStockGrams: int("low_stock_grams").notNull().default(200),
    version: int("version").notNull().default(1),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    updatedAt: datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("materials_type_idx").on(t.type)],
);

/** One physical spool: its colour, what is left on it, and the printer it sits on (if any). */
export const spools = mysqlTable(
  "spools",
  {
    id: int("id").autoincrement().primaryKey(),
    materialId: int("material_id")
      .notNull()
      .references(() => materials.id, { onDelete: "restrict" }),
    label: varchar("label", { length: 80 }).notNull().unique(),
    colour: varchar("colour", { length: 40 }).notNull(),
    /** Net filament when new, grams. */
    gramsInitial: double("grams_initial").notNull(),
    gramsRemaining: double("grams_remaining").notNull(),
    /** NULL when on the shelf; unique so a printer holds one spool at a time. */
    loadedPrinterId: int("loaded_printer_id").references(() => printers.id, { onDelete: "set null" }),
    loadedAt: datetime("loaded_at", { mode: "date", fsp: 3 }),
    version: int("version").notNull().default(1),
    createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    updatedAt: datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("spools_material_idx").on(t.materialId), uniqueIndex("spools_loaded_printer_uq").on(t.loadedPrinterId)],
);
