import "server-only";
import type { RowDataPacket } from "mysql2";
import { pool } from "@/db";
import { changeGeneration } from "@/db/change-watch";
import type { PlanMetrics } from "@/lib/plan/schema";
import { can } from "@/lib/permissions";
import type { PlateStatus } from "@/lib/validation/plates";
import { AppError } from "./errors";
import { cachedOpenIntervals } from "./hours";
import { moveTargets, type FitItem, type FitPrinter } from "./plate-fit";
import { BED_MARGIN_MM } from "./planner";
import { normColour } from "./spool-stock";
import type { SessionUser } from "./session";

const HOUR = 3_600_000;

export interface BoardPlate {
  id: number;
  printerId: number;
  status: PlateStatus;
  material: string;
  colour: string;
  /** ISO instants (UTC). */
  plannedStart: string;
  plannedEnd: string;
  startedAt: string | null;
  endedAt: string | null;
  runsUnattended: boolean;
  estimatedMinutes: number;
  estimatedGrams: number;
  version: number;
  items: number;
  /**
   * For a planned plate, the spool change before it, worked out from what is loaded now and the
   * plates ahead of it on the same printer (null = the right spool is already on by then).
   */
  change: SpoolChangeWire | null;
  /** For a planned plate, the change Start needs against the spool loaded right now (the plan's may assume plates before it). */
  startChange: SpoolChangeWire | null;
  /** For a planned plate, the printers it may move to (plate-fit.ts, the rule movePlate checks). */
  moveTo: { id: number; name: string }[];
}

export type SpoolChangeWire = { from: { material: string; colour: string } | null; to: { material: string; colour: string } };

export interface BoardSpool {
  id: number;
  label: string;
  /** Material family key (pla, petg, …) and the colour as written on the spool. */
  type: string;
  colour: string;
  grams: number;
  printerId: number | null;
}

export interface BoardLane {
  id: number;
  name: string;
  state: string;
  spool: { material: string; colour: string; type: string } | null;
  plates: BoardPlate[];
}

export interface BoardWaiting {
  entryId: number;
  version: number;
  instanceId: number;
  copyNo: number;
  reprints: number;
  partId: number;
  partName: string;
  material: string;
  colour: string | null;
  member: string;
  priority: number;
  wishedDate: string | null;
  reason: string | null;
}

export interface FloorBoard {
  now: string;
  timezone: string;
  window: { from: string; to: string };
  open: { from: string; to: string }[];
  lanes: BoardLane[];
  lastRunAt: string | null;
  metrics: PlanMetrics | null;
  waiting: BoardWaiting[];
  spools: BoardSpool[];
}

type RawPlate = Omit<BoardPlate, "runsUnattended" | "change" | "startChange" | "moveTo"> & { runsUnattended: number; shape: { x: number; y: number; r: number; sx: number; sy: number; sz: number }[] | null };
type RawLane = { id: number; name: string; state: string; spoolMaterial: string | null; spoolColour: string | null; spoolType: string | null; bedX: number; bedY: number; height: number; enclosed: number; materials: string | null };
type RawWaiting = Omit<BoardWaiting, "reason">;

// Everything the board shows, in one statement (one round trip): the printers with their loaded
// spool, the live plates and those ended since `?`, the waiting list and the last plan. Each list
// comes back as one JSON array, so only the columns the board shows are read and sent. The plate
// filter is written as ranges on (status, ended_at) so it reads plates_status_ended_idx, not the
// whole plate history. group_concat_max_len (which also bounds JSON_ARRAYAGG) is raised for this
// statement only.
const BOARD_SQL = `SET STATEMENT group_concat_max_len = 268435456 FOR
SELECT
  (SELECT JSON_ARRAYAGG(JSON_OBJECT('id', pr.id, 'name', pr.name, 'state', pr.state, 'spoolMaterial', m.name, 'spoolColour', sp.colour, 'spoolType', m.type,
          'bedX', pr.bed_x_mm, 'bedY', pr.bed_y_mm, 'height', pr.height_mm, 'enclosed', pr.enclosed,
          'materials', (SELECT GROUP_CONCAT(pm.material_type) FROM printer_materials pm WHERE pm.printer_id = pr.id)) ORDER BY pr.name)
     FROM printers pr LEFT JOIN spools sp ON sp.loaded_printer_id = pr.id LEFT JOIN materials m ON m.id = sp.material_id) AS lanes,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT('id', p.id, 'printerId', p.printer_id, 'status', p.status, 'material', p.material, 'colour', p.colour,
          'plannedStart', p.planned_start, 'plannedEnd', p.planned_end, 'startedAt', p.started_at, 'endedAt', p.ended_at,
          'runsUnattended', p.runs_unattended, 'estimatedMinutes', p.estimated_minutes, 'estimatedGrams', p.estimated_grams, 'version', p.version,
          'items', (SELECT COUNT(*) FROM plate_items pi WHERE pi.plate_id = p.id),
          'shape', IF(p.status = 'planned', (SELECT JSON_ARRAYAGG(JSON_OBJECT('x', pi.x, 'y', pi.y, 'r', pi.rotated, 'sx', pi.size_x, 'sy', pi.size_y, 'sz', pi.size_z))
             FROM plate_items pi WHERE pi.plate_id = p.id), NULL)) ORDER BY p.planned_start, p.id)
     FROM plates p
     WHERE p.status IN ('planned', 'printing') OR (p.status IN ('finished', 'failed', 'cancelled') AND p.ended_at >= ?)) AS plates,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT('entryId', qe.id, 'version', qe.version, 'instanceId', pi.id, 'copyNo', pi.copy_no, 'reprints', pi.reprints,
          'partId', pa.id, 'partName', pa.name, 'material', pa.material, 'colour', pa.colour, 'member', u.name, 'priority', qe.priority,
          'wishedDate', qe.wished_date) ORDER BY qe.priority DESC, qe.sent_at, pi.id)
     FROM queue_entries qe
     JOIN part_instances pi ON pi.id = qe.instance_id
     JOIN parts pa ON pa.id = pi.part_id
     JOIN users u ON u.id = qe.member_id
     WHERE pi.status = 'queued') AS waiting,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT('id', sp.id, 'label', sp.label, 'type', m.type, 'colour', sp.colour, 'grams', sp.grams_remaining, 'printerId', sp.loaded_printer_id) ORDER BY m.type, sp.colour, sp.label)
     FROM spools sp JOIN materials m ON m.id = sp.material_id WHERE sp.grams_remaining > 0) AS spools,
  ps.last_run_at AS lastRunAt, ps.last_metrics AS metrics, ps.unplaced AS unplaced
FROM (SELECT 1) one LEFT JOIN planner_state ps ON ps.id = 1`;

interface BoardRow extends RowDataPacket {
  lanes: unknown;
  plates: unknown;
  waiting: unknown;
  spools: unknown;
  lastRunAt: Date | null;
  metrics: unknown;
  unplaced: unknown;
}

/** A JSON column as the driver hands it over: text (MariaDB's JSON is LONGTEXT) or, with type metadata, already parsed. */
const parsed = <T>(json: unknown): T | null => (json === null || json === undefined ? null : typeof json === "string" ? (JSON.parse(json) as T) : (json as T));
const list = <T>(json: unknown): T[] => parsed<T[]>(json) ?? [];
/** MariaDB writes a DATETIME(3) inside JSON as "YYYY-MM-DD hh:mm:ss.fff", in UTC here (the pool's time zone is Z). */
const iso = (s: string | null): string | null => (s === null ? null : new Date(`${s.replace(" ", "T")}Z`).toISOString());

interface BoardData {
  lanes: (Omit<BoardLane, "plates"> & { fit: FitPrinter })[];
  /** Sorted by planned start; `endedMs` for the per-request "ended in the last day" filter. */
  plates: { plate: Omit<BoardPlate, "change" | "startChange" | "moveTo">; endedMs: number | null; shape: FitItem[] }[];
  waiting: BoardWaiting[];
  spools: BoardSpool[];
  lastRunAt: string | null;
  metrics: PlanMetrics | null;
  /** The plates ended before this instant were left out by the query. */
  since: number;
  generation: number;
  at: number;
}

function deepFreeze<T>(v: T): T {
  if (v && typeof v === "object" && !Object.isFrozen(v)) {
    Object.freeze(v);
    for (const x of Object.values(v)) deepFreeze(x);
  }
  return v;
}

async function loadBoard(since: number, generation: number): Promise<BoardData> {
  const [[row]] = await pool().query<BoardRow[]>(BOARD_SQL, [new Date(since)]);
  if (!row) throw new Error("floor board: no row");
  const plates = list<RawPlate>(row.plates).map(({ shape, ...p }) => {
    const plate = { ...p, plannedStart: iso(p.plannedStart)!, plannedEnd: iso(p.plannedEnd)!, startedAt: iso(p.startedAt), endedAt: iso(p.endedAt), runsUnattended: p.runsUnattended === 1 };
    const items = (shape ?? []).map((i) => ({ x: i.x, y: i.y, rotated: i.r === 1, sizeX: i.sx, sizeY: i.sy, sizeZ: i.sz }));
    return { plate, endedMs: plate.endedAt === null ? null : Date.parse(plate.endedAt), shape: items };
  });
  const lanes = list<RawLane>(row.lanes).map(({ spoolMaterial, spoolColour, spoolType, bedX, bedY, height, enclosed, materials, ...l }) => ({
    ...l,
    spool: spoolMaterial === null ? null : { material: spoolMaterial, colour: spoolColour ?? "", type: spoolType ?? "" },
    fit: { id: l.id, name: l.name, state: l.state, bedX, bedY, height, enclosed: enclosed === 1, materials: materials ? materials.split(",") : [] },
  }));
  const why = new Map(list<{ instanceId: number; reason: string }>(row.unplaced).map((u) => [u.instanceId, u.reason]));
  const waiting = list<RawWaiting>(row.waiting).map((w): BoardWaiting => ({ ...w, reason: why.get(w.instanceId) ?? null }));
  const spools = list<BoardSpool>(row.spools);
  return deepFreeze({ lanes, plates, waiting, spools, lastRunAt: row.lastRunAt ? row.lastRunAt.toISOString() : null, metrics: parsed<PlanMetrics>(row.metrics), since, generation, at: Date.now() });
}

/**
 * The board's rows, shared by the requests of this process until anything they show may have
 * changed: an entry (or a read under way) is used only while the change counter of db/change-watch.ts
 * still has the value it had when its read began, and that counter moves after every write through
 * the pool has completed or committed. So once a write of this process has returned, no request sees
 * the board from before it. BOARD_TTL_MS bounds how long a write by another process goes unseen.
 * The app runs as one Node process per database (see DEVELOPERS.md).
 */
const BOARD_TTL_MS = 2_000;
let boardEntry: BoardData | null = null;
let boardLoad: { generation: number; since: number; promise: Promise<BoardData> } | null = null;

function boardData(since: number): Promise<BoardData> {
  const generation = changeGeneration();
  const hit = boardEntry;
  if (hit && hit.generation === generation && hit.since <= since && Date.now() - hit.at < BOARD_TTL_MS) return Promise.resolve(hit);
  const pending = boardLoad;
  if (pending && pending.generation === generation && pending.since <= since) return pending.promise;
  const promise = loadBoard(since, generation).then((d) => {
    if (changeGeneration() === generation) boardEntry = d;
    return d;
  });
  boardLoad = { generation, since, promise };
  const clear = () => {
    if (boardLoad?.promise === promise) boardLoad = null;
  };
  promise.then(clear, clear);
  return promise;
}

/**
 * The Floor: one lane per printer with its live plates and those ended in the last day, the
 * attended spells over the window drawn, and the waiting list. Operators and admins.
 */
export async function floorBoard(user: SessionUser, now = new Date()): Promise<FloorBoard> {
  if (!can(user.role, "queue:manage")) throw new AppError("forbidden", "Only operators and admins see the Floor.");
  const since = now.getTime() - 24 * HOUR;
  const data = await boardData(since);
  const byPrinter = new Map<number, BoardPlate[]>();
  const fits = data.lanes.map((l) => l.fit);
  const held = new Map(data.lanes.map((l) => [l.id, l.spool ? { material: l.spool.type, colour: normColour(l.spool.colour) } : null]));
  const loadedNow = new Map(held);
  let lastEnd = now.getTime() + 36 * HOUR;
  // Plates come sorted by planned start, so each printer's spool is followed plate by plate.
  const live = (s: PlateStatus) => s === "planned" || s === "printing";
  type Held = { material: string; colour: string } | null;
  const changeFrom = (from: Held, to: { material: string; colour: string }): SpoolChangeWire | null =>
    !from || from.material !== to.material || (to.colour !== "any" && from.colour !== to.colour) ? { from, to } : null;
  for (const { plate, endedMs, shape } of data.plates) {
    if (!live(plate.status) && (endedMs === null || endedMs < since)) continue;
    lastEnd = Math.max(lastEnd, Date.parse(plate.plannedEnd));
    let change: BoardPlate["change"] = null;
    let startChange: BoardPlate["startChange"] = null;
    let moveTo: BoardPlate["moveTo"] = [];
    if (live(plate.status)) {
      const to = { material: plate.material, colour: normColour(plate.colour) };
      if (plate.status === "planned") {
        change = changeFrom(held.get(plate.printerId) ?? null, to);
        startChange = changeFrom(loadedNow.get(plate.printerId) ?? null, to);
      }
      held.set(plate.printerId, to);
    }
    if (plate.status === "planned") moveTo = moveTargets(plate, shape, fits, BED_MARGIN_MM).map((p) => ({ id: p.id, name: p.name }));
    const full: BoardPlate = { ...plate, change, startChange, moveTo };
    const l = byPrinter.get(plate.printerId);
    if (l) l.push(full);
    else byPrinter.set(plate.printerId, [full]);
  }
  // The timeline zooms between a day and a week from here: the opening hours cover the widest view.
  const from = new Date(now.getTime() - 12 * HOUR);
  const to = new Date(Math.max(Math.min(lastEnd + 2 * HOUR, now.getTime() + 8 * 24 * HOUR), now.getTime() + 7 * 24 * HOUR));
  const cal = await cachedOpenIntervals(from, to);
  return {
    now: now.toISOString(),
    timezone: cal.timezone,
    window: { from: from.toISOString(), to: to.toISOString() },
    open: cal.open.map((i) => ({ from: new Date(i.start).toISOString(), to: new Date(i.end).toISOString() })),
    lanes: data.lanes.map(({ fit: _fit, ...l }) => ({ ...l, plates: byPrinter.get(l.id) ?? [] })),
    lastRunAt: data.lastRunAt,
    metrics: data.metrics,
    waiting: data.waiting,
    spools: data.spools,
  };
}
