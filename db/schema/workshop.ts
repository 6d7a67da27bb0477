import { datetime, double, int, mysqlTable, varchar } from "drizzle-orm/mysql-core";
import { sql } from "drizzle-orm";

/** One row (id 1): the workshop's own settings. */
export const workshopSettings = mysqlTable("workshop_settings", {
  id: int("id").primaryKey(),
  name: varchar("name", { length: 120 }).notNull(),
  timezone: varchar("timezone", { length: 64 }).notNull().default("Europe/Berlin"),
  currency: varchar("currency", { length: 3 }).notNull().default("EUR"),
  contactEmail: varchar("contact_email", { length: 254 }).notNull().default(""),
  defaultLayerHeightMm: double("default_layer_height_mm").notNull().default(0.2),
  defaultWalls: int("default_walls").notNull().default(3),
  defaultInfillPercent: int("default_infill_percent").notNull().default(15),
  /** Fixed fee per plate, smallest currency unit. */
  plateFeeCents: int("plate_fee_cents").notNull().default(0),
  safetyNote: varchar("safety_note", { length: 1000 }).notNull().default(""),
  /** May plates run while nobody is there (nights, weekends)? Default yes, as before the setting. */
  unattendedAllowed: int("unattended_allowed").notNull().default(1),
  /** Longest stretch a plate may run unattended, hours; NULL = no cap. */
  unattendedMaxHours: double("unattended_max_hours"),
  version: int("version").notNull().default(1),
  updatedAt: datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
});

export type WorkshopSettingsRow = typeof workshopSettings.$inferSelect;
