import { sql } from "drizzle-orm";
import { date, datetime, double, index, int, json, mysqlEnum, mysqlTable, bigint, char, uniqueIndex, varchar } from "drizzle-orm/mysql-core";
import { partStatuses, itemStatuses } from "../../lib/status";
import { users } from "./users";

const createdAt = () => datetime("created_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`);
const updatedAt = () => datetime("updated_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`);

/** An assembly or a sub-assembly (parent set). root_id lets one query load a whole tree. */
export const assemblies = mysqlTable(
  "assemblies",
  {
    id: int("id").autoincrement().primaryKey(),
    ownerId: int("owner_id").notNull().references(() => users.id),
    parentId: int("parent_id"),
    rootId: int("root_id"),
    name: varchar("name", { length: 120 }).notNull(),
    description: varchar("description", { length: 2000 }).notNull().default(""),
    targetDate: date("target_date", { mode: "string" }),
    version: int("version").notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("assemblies_owner_idx").on(t.ownerId), index("assemblies_root_idx").on(t.rootId), index("assemblies_parent_idx").on(t.parentId)],
);

export const shareAccess = ["read", "edit"] as const;
export type ShareAccess = (typeof shareAccess)[number];

/** A share covers the assembly and everything below it. */
export const assemblyShares = mysqlTable(
  "assembly_shares",
  {
    id: int("id").autoincrement().primaryKey(),
    assemblyId: int("assembly_id").notNull().references(() => assemblies.id, { onDelete: "cascade" }),
    userId: int("user_id").notNull().references(() => users.id),
    access: mysqlEnum("access", shareAccess).notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("assembly_shares_pair").on(t.assemblyId, t.userId), index("assembly_shares_user_idx").on(t.userId)],
);

export const parts = mysqlTable(
  "parts",
  {
    id: int("id").autoincrement().primaryKey(),
    assemblyId: int("assembly_id").notNull().references(() => assemblies.id, { onDelete: "cascade" }),
    name: varchar("name", { length: 120 }).notNull(),
    quantity: int("quantity").notNull().default(1),
    material: varchar("material", { length: 40 }).notNull().default("PLA"),
    colour: varchar("colour", { length: 40 }).notNull().default(""),
    layerHeightMm: double("layer_height_mm").notNull(),
    walls: int("walls").notNull(),
    infillPercent: int("infill_percent").notNull(),
    notes: varchar("notes", { length: 2000 }).notNull().default(""),
    currentFileId: int("current_file_id"),
    version: int("version").notNull().default(1),
    createdAt: createdAt(),
    updatedAt: updatedAt(),
  },
  (t) => [index("parts_assembly_idx").on(t.assemblyId)],
);

/** Stored bytes, content-addressed: the same bytes are kept once whoever uploads them. */
export const meshBlobs = mysqlTable("mesh_blobs", {
  sha256: char("sha256", { length: 64 }).primaryKey(),
  sizeBytes: bigint("size_bytes", { mode: "number" }).notNull(),
  createdAt: createdAt(),
});

/** One uploaded version of a part's mesh, with the server's analysis of it (units matter for STL). A STEP
 * upload is kept as `source_sha256` beside the 3MF mesh made from it (`sha256`, which every reader uses). */
export const partFiles = mysqlTable(
  "part_files",
  {
    id: int("id").autoincrement().primaryKey(),
    partId: int("part_id").notNull().references(() => parts.id, { onDelete: "cascade" }),
    sha256: char("sha256", { length: 64 }).notNull().references(() => meshBlobs.sha256),
    /** The file as uploaded when `sha256` is a mesh made from it (a STEP file tessellated to 3MF). */
    sourceSha256: char("source_sha256", { length: 64 }).references(() => meshBlobs.sha256),
    versionNo: int("version_no").notNull(),
    originalName: varchar("original_name", { length: 255 }).notNull(),
    units: mysqlEnum("units", ["mm", "in"]).notNull(),
    format: varchar("format", { length: 16 }).notNull(),
    sizeX: double("size_x").notNull(),
    sizeY: double("size_y").notNull(),
    sizeZ: double("size_z").notNull(),
    volumeMm3: double("volume_mm3").notNull(),
    watertight: int("watertight").notNull(),
    analysis: json("analysis").notNull(),
    uploadedBy: int("uploaded_by").notNull().references(() => users.id),
    uploadedAt: createdAt(),
    /** Set on a version made by the automatic repair: the version it was made from, and what was done (before/after figures). */
    repairedFromFileId: int("repaired_from_file_id"),
    repairReport: json("repair_report"),
    /** An operator accepted this mesh as it is although it is not a closed solid (who, when, why). */
    acceptedBrokenBy: int("accepted_broken_by").references(() => users.id),
    acceptedBrokenAt: datetime("accepted_broken_at", { mode: "date", fsp: 3 }),
    acceptedBrokenNote: varchar("accepted_broken_note", { length: 500 }),
  },
  (t) => [uniqueIndex("part_files_version").on(t.partId, t.versionNo), index("part_files_sha_idx").on(t.sha256)],
);

/** One row per copy needed: a part needed 4 times moves as 4 instances. */
export const partInstances = mysqlTable(
  "part_instances",
  {
    id: int("id").autoincrement().primaryKey(),
    partId: int("part_id").notNull().references(() => parts.id, { onDelete: "cascade" }),
    copyNo: int("copy_no").notNull(),
    status: mysqlEnum("status", partStatuses).notNull().default("drafted"),
    reprints: int("reprints").notNull().default(0),
    version: int("version").notNull().default(1),
    updatedAt: updatedAt(),
  },
  (t) => [uniqueIndex("part_instances_copy").on(t.partId, t.copyNo), index("part_instances_status_idx").on(t.status)],
);

export const statusEvents = mysqlTable(
  "part_status_events",
  {
    id: int("id").autoincrement().primaryKey(),
    instanceId: int("instance_id").notNull().references(() => partInstances.id, { onDelete: "cascade" }),
    fromStatus: mysqlEnum("from_status", partStatuses),
    toStatus: mysqlEnum("to_status", partStatuses).notNull(),
    byUserId: int("by_user_id").notNull().references(() => users.id),
    at: datetime("at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
    reason: varchar("reason", { length: 500 }).notNull().default(""),
  },
  (t) => [index("part_status_events_instance_idx").on(t.instanceId)],
);

export const itemKinds = ["hardware", "made"] as const;

/** Bought hardware and parts made elsewhere, in the same tree as printed parts. */
export const items = mysqlTable(
  "assembly_items",
  {
    id: int("id").autoincrement().primaryKey(),
    assemblyId: int("assembly_id").notNull().references(() => assemblies.id, { onDelete: "cascade" }),
    kind: mysqlEnum("kind", itemKinds).notNull(),
    name: varchar("name", { length: 120 }).notNull(),
    quantity: int("quantity").notNull().default(1),
    source: varchar("source", { length: 500 }).notNull().default(""),
    unitPriceCents: int("unit_price_cents"),
    dueDate: date("due_date", { mode: "string" }),
    status: mysqlEnum("status", itemStatuses).notNull().default("to_order"),
    notes: varchar("notes", { length: 1000 }).notNull().default(""),
    version: int("version").notNull().default(1),
    createdAt: createdAt(),
  },
  (t) => [index("assembly_items_assembly_idx").on(t.assemblyId)],
);
