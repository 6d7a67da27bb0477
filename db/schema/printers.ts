import { datetime, double, index, int, mysqlEnum, mysqlTable, primaryKey, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";
// The enum values live beside the zod schemas so client forms need not import drizzle.
import { materialTypes, printerStates } from "../../lib/validation/printers";

export { materialTypes, printerStates, type MaterialType, type PrinterState } from "../../lib/validation/printers";

export const printers = mysqlTable("printers", {
  id: int("id").autoincrement().primaryKey(),
  name: varchar("name", { length: 80 }).notNull().unique(),
  bedXMm: double("bed_x_mm").notNull(),
  bedYMm: double("bed_y_mm").notNull(),
  heightMm: double("height_mm").notNull(),
  nozzleMm: double("nozzle_mm").notNull().default(0.4),
  enclosed: int("enclosed").notNull().default(0),
  /** Machine time charge, smallest currency unit per hour. */
  hourlyRateCents: int("hourly_rate_cents").notNull().default(0),
  /** Effective average flow over a whole print, mm³/s (see lib/estimate README). */
  volumetricFlowMm3s: double("volumetric_flow_mm3s").notNull().default(5),
  perLayerSeconds: double("per_layer_seconds").notNull().default(3),
  startupMinutes: double("startup_minutes").notNull().default(6),
  state: mysqlEnum("state", printerStates).notNull().default("available"),
  maintenanceNote: varchar("maintenance_note", { length: 500 }).notNull().default(""),
  expectedBackAt: datetime("expected_back_at", { mode: "date", fsp: 3 }),
  version: int("version").notNull().default(1),
  createdAt: datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  updatedAt: datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
});

/** The material families a printer may print. */
export const printerMaterials = mysqlTable(
  "printer_materials",
  {
    printerId: int("printer_id")
      .notNull()
      .references(() => printers.id, { onDelete: "cascade" }),
    materialType: mysqlEnum("material_type", materialTypes).notNull(),
  },
  (t) => [primaryKey({ columns: [t.printerId, t.materialType] })],
);

/** Finished plates per printer: estimated against actual, for the calibration factor. */
export const printHistory = mysqlTable(
  "print_history",
  {
    id: int("id").autoincrement().primaryKey(),
    printerId: int("printer_id")
      .notNull()
      .references(() => printers.id, { onDelete: "cascade" }),
    /** The plate this row records; nullable until plates exist. */
    plateId: int("plate_id"),
    estimatedMinutes: double("estimated_minutes").notNull(),
    actualMinutes: double("actual_minutes").notNull(),
    estimatedGrams: double("estimated_grams").notNull(),
    actualGrams: double("actual_grams"),
    finishedAt: datetime("finished_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("print_history_printer_idx").on(t.printerId, t.finishedAt)],
);

/**
 * When someone is there to start a plate or take one off the bed: windows per weekday
 * (1 = Monday … 7 = Sunday) as local "HH:MM" in the workshop's time zone. A day without rows is closed.
 */
export const attendedHours = mysqlTable(
  "attended_hours",
  {
    id: int("id").autoincrement().primaryKey(),
    weekday: int("weekday").notNull(),
    opensAt: varchar("opens_at", { length: 5 }).notNull(),
    closesAt: varchar("closes_at", { length: 5 }).notNull(),
  },
  (t) => [uniqueIndex("attended_hours_day_open_uq").on(t.weekday, t.opensAt)],
);
