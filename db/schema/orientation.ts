import { sql } from "drizzle-orm";
import { datetime, double, index, int, json, mysqlEnum, mysqlTable, uniqueIndex } from "drizzle-orm/mysql-core";
import { partFiles, parts } from "./assemblies";
import { users } from "./users";

export const orientationKinds = ["chosen", "suggested"] as const;
export type OrientationKind = (typeof orientationKinds)[number];

/**
 * A part's orientation for one file version: the member's pick ("chosen") and the server's last
 * search result ("suggested"), one of each per part. The row names the file it was computed for,
 * so a new upload leaves it behind: the effective orientation is the chosen row for the current
 * file, else the file's own. Footprint and height are stored so packing need not re-read the mesh.
 */
export const partOrientations = mysqlTable(
  "part_orientations",
  {
    id: int("id").autoincrement().primaryKey(),
    partId: int("part_id")
      .notNull()
      .references(() => parts.id, { onDelete: "cascade" }),
    fileId: int("file_id")
      .notNull()
      .references(() => partFiles.id, { onDelete: "cascade" }),
    kind: mysqlEnum("kind", orientationKinds).notNull(),
    /** Unit quaternion [x, y, z, w] and the same rotation as a row-major 3×3 matrix. */
    quaternion: json("quaternion").notNull(),
    matrix: json("matrix").notNull(),
    /** The file-frame direction that faces the bed. */
    downX: double("down_x").notNull(),
    downY: double("down_y").notNull(),
    downZ: double("down_z").notNull(),
    footprintX: double("footprint_x").notNull(),
    footprintY: double("footprint_y").notNull(),
    heightMm: double("height_mm").notNull(),
    /** Overhang, support, layers, contact, fits and score as the search reported them. */
    summary: json("summary").notNull(),
    chosenBy: int("chosen_by").references(() => users.id),
    chosenAt: datetime("chosen_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [uniqueIndex("part_orientations_kind_uq").on(t.partId, t.kind), index("part_orientations_file_idx").on(t.fileId)],
);

/**
 * A part cut into pieces: one row per piece, all sharing the parent's split time. The parent keeps
 * its files and history but no longer prints; the pieces are new parts in the same assembly.
 */
export const partSplits = mysqlTable(
  "part_splits",
  {
    id: int("id").autoincrement().primaryKey(),
    parentPartId: int("parent_part_id")
      .notNull()
      .references(() => parts.id, { onDelete: "cascade" }),
    piecePartId: int("piece_part_id")
      .notNull()
      .references(() => parts.id, { onDelete: "cascade" }),
    /** The cut: planes in the parent's print frame, the rotation used, and the piece's own turn. */
    plane: json("plane").notNull(),
    splitBy: int("split_by")
      .notNull()
      .references(() => users.id),
    splitAt: datetime("split_at", { mode: "date", fsp: 3 }).notNull().default(sql`CURRENT_TIMESTAMP(3)`),
  },
  (t) => [uniqueIndex("part_splits_piece_uq").on(t.piecePartId), index("part_splits_parent_idx").on(t.parentPartId)],
);
