import { sql } from "drizzle-orm";
import { date, datetime, double, index, int, json, mysqlEnum, mysqlTable, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { partInstances } from "./assemblies";
import { printers } from "./printers";
import { users } from "./users";
// The enum values live beside the zod schemas so client code need not import drizzle.
import { plateStatuses } from "../../lib/validation/plates";

export { plateStatuses, type PlateStatus } from "../../lib/validation/plates";

const at = (name: string) => datetime(name, { mode: "date", fsp: 3 });

/**
 * One row per part instance the workshop has been asked to print. The sender's wished date and
 * priority feed the planner; the operator may change the priority.
 */
export const queueEntries = mysqlTable(
  "queue_entries",
  {
    id: int("id").autoincrement().primaryKey(),
    instanceId: int("instance_id")
      .notNull()
      .references(() => partInstances.id, { onDelete: "cascade" }),
    /** The member the work is for (the assembly's owner), for fair share and charges. */
    memberId: int("member_id")
      .notNull()
      .references(() => users.id),
    sentBy: int("sent_by")
      .notNull()
      .references(() => users.id),
    wishedDate: date("wished_date", { mode: "string" }),
    priority: int("priority").notNull().default(0),
    sentAt: at("sent_at").notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    version: int("version").notNull().default(1),
  },
  (t) => [uniqueIndex("queue_entries_instance_uq").on(t.instanceId), index("queue_entries_member_idx").on(t.memberId)],
);

/** One build plate's run on one printer. The quote kept at planning (refreshed at start) is what is charged. */
export const plates = mysqlTable(
  "plates",
  {
    id: int("id").autoincrement().primaryKey(),
    printerId: int("printer_id")
      .notNull()
      .references(() => printers.id),
    status: mysqlEnum("status", plateStatuses).notNull().default("planned"),
    material: varchar("material", { length: 20 }).notNull(),
    colour: varchar("colour", { length: 40 }).notNull(),
    plannedStart: at("planned_start").notNull(),
    plannedEnd: at("planned_end").notNull(),
    startedAt: at("started_at"),
    endedAt: at("ended_at"),
    runsUnattended: int("runs_unattended").notNull().default(0),
    caution: varchar("caution", { length: 500 }),
    /** The spool change the plan asks for before this plate (NULL = the right spool is already on). */
    changeFromMaterial: varchar("change_from_material", { length: 20 }),
    changeFromColour: varchar("change_from_colour", { length: 40 }),
    changeToMaterial: varchar("change_to_material", { length: 20 }),
    changeToColour: varchar("change_to_colour", { length: 40 }),
    estimatedMinutes: double("estimated_minutes").notNull(),
    estimatedGrams: double("estimated_grams").notNull(),
    actualMinutes: double("actual_minutes"),
    actualGrams: double("actual_grams"),
    shelfLabel: varchar("shelf_label", { length: 60 }),
    reason: varchar("reason", { length: 500 }),
    quote: json("quote").notNull(),
    quotedAt: at("quoted_at").notNull(),
    version: int("version").notNull().default(1),
    createdAt: at("created_at").notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    updatedAt: at("updated_at").notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [index("plates_printer_idx").on(t.printerId, t.plannedStart), index("plates_status_ended_idx").on(t.status, t.endedAt)],
);

/**
 * A part instance on a plate, placed where the plan put it (x, y: lower-left of the footprint
 * after any turn, bed mm). active_instance_id equals instance_id while the plate is planned or
 * printing and is NULL after: its UNIQUE index means no instance is ever on two live plates.
 */
export const plateItems = mysqlTable(
  "plate_items",
  {
    id: int("id").autoincrement().primaryKey(),
    plateId: int("plate_id")
      .notNull()
      .references(() => plates.id, { onDelete: "cascade" }),
    instanceId: int("instance_id")
      .notNull()
      .references(() => partInstances.id, { onDelete: "cascade" }),
    activeInstanceId: int("active_instance_id"),
    memberId: int("member_id")
      .notNull()
      .references(() => users.id),
    x: double("x").notNull(),
    y: double("y").notNull(),
    rotated: int("rotated").notNull().default(0),
    /** Footprint before the turn, and height, mm: what the plan used. */
    sizeX: double("size_x").notNull(),
    sizeY: double("size_y").notNull(),
    sizeZ: double("size_z").notNull(),
    minutes: double("minutes").notNull(),
    grams: double("grams").notNull(),
    /** The mesh version (part_files.id) the copy was planned with: the plate's 3MF is made from it. */
    fileId: int("file_id"),
  },
  (t) => [
    uniqueIndex("plate_items_active_uq").on(t.activeInstanceId),
    index("plate_items_plate_idx").on(t.plateId),
    index("plate_items_instance_idx").on(t.instanceId),
  ],
);

/** A single row (id 1) that re-plans lock, so two re-plans never interleave; keeps the last run's figures. */
export const plannerState = mysqlTable("planner_state", {
  id: int("id").primaryKey(),
  lastRunAt: at("last_run_at"),
  lastRunBy: int("last_run_by"),
  lastMetrics: json("last_metrics"),
  unplaced: json("unplaced"),
});
