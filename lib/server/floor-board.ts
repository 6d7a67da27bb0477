import "server-only";
import type { RowDataPacket } from "mysql2";
import { pool } from "@/db";
import { changeGeneration } from "@/db/change-watch";
import type { PlanMetrics } from "@/lib/plan/schema";
import { can } from "@/lib/permissions";
import type { PlateStatus } from "@/lib/validation/plates";
import { AppError } from "./errors";
import { cachedOpenIntervals } from "./hours";
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
}

export interface BoardLane {
  id: number;
  name: string;
  state: string;
  spool: { material: string; colour: string } | null;
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
}

type RawPlate = Omit<BoardPlate, "runsUnattended"> & { runsUnattended: number };
type RawLane = { id: number; name: string; state: string; spoolMaterial: string | null; spoolColour: string | null };
type RawWaiting = Omit<BoardWaiting, "reason">;

// Everything the board shows, in one statement (one round trip): the printers with their loaded
// spool, the live plates and those ended since `?`, the waiting list and the last plan. Each list
// comes back as one JSON array, so only the columns the board shows are read and sent. The plate
// filter is written as ranges on (status, ended_at) so it reads plates_status_ended_idx, not the
// whole plate history. group_concat_max_len (which also bounds JSON_ARRAYAGG) is raised for this
// statement only.
const BOARD_SQL = `SET STATEMENT group_concat_max_len = 268435456 FOR
SELECT
  (SELECT JSON_ARRAYAGG(JSON_OBJECT('id', pr.id, 'name', pr.name, 'state', pr.state, 'spoolMaterial', m.name, 'spoolColour', sp.colour) ORDER BY pr.name)
     FROM printers pr LEFT JOIN spools sp ON sp.loaded_printer_id = pr.id LEFT JOIN materials m ON m.id = sp.material_id) AS lanes,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT('id', p.id, 'printerId', p.printer_id, 'status', p.status, 'material', p.material, 'colour', p.colour,
          'plannedStart', p.planned_start, 'plannedEnd', p.planned_end, 'startedAt', p.started_at, 'endedAt', p.ended_at,
          'runsUnattended', p.runs_unattended, 'estimatedMinutes', p.estimated_minutes, 'estimatedGrams', p.estimated_grams, 'version', p.version,
          'items', (SELECT COUNT(*) FROM plate_items pi WHERE pi.plate_id = p.id)) ORDER BY p.planned_start, p.id)
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
  ps.last_run_at AS lastRunAt, ps.last_metrics AS metrics, ps.unplaced AS unplaced
FROM (SELECT 1) one LEFT JOIN planner_state ps ON ps.id = 1`;

interface BoardRow extends RowDataPacket {
  lanes: unknown;
  plates: unknown;
  waiting: unknown;
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
  lanes: Omit<BoardLane, "plates">[];
  /** Sorted by planned start; `endedMs` for the per-request "ended in the last day" filter. */
  plates: { plate: BoardPlate; endedMs: number | null }[];
  waiting: BoardWaiting[];
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
  const plates = list<RawPlate>(row.plates).map((p) => {
    const plate: BoardPlate = { ...p, plannedStart: iso(p.plannedStart)!, plannedEnd: iso(p.plannedEnd)!, startedAt: iso(p.startedAt), endedAt: iso(p.endedAt), runsUnattended: p.runsUnattended === 1 };
    return { plate, endedMs: plate.endedAt === null ? null : Date.parse(plate.endedAt) };
  });
  const lanes = list<RawLane>(row.lanes).map(({ spoolMaterial, spoolColour, ...l }) => ({ ...l, spool: spoolMaterial === null ? null : { material: spoolMaterial, colour: spoolColour ?? "" } }));
  const why = new Map(list<{ instanceId: number; reason: string }>(row.unplaced).map((u) => [u.instanceId, u.reason]));
  const waiting = list<RawWaiting>(row.waiting).map((w): BoardWaiting => ({ ...w, reason: why.get(w.instanceId) ?? null }));
  return deepFreeze({ lanes, plates, waiting, lastRunAt: row.lastRunAt ? row.lastRunAt.toISOString() : null, metrics: parsed<PlanMetrics>(row.metrics), since, generation, at: Date.now() });
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
  let lastEnd = now.getTime() + 36 * HOUR;
  for (const { plate, endedMs } of data.plates) {
    if ((plate.status !== "planned" && plate.status !== "printing") && (endedMs === null || endedMs < since)) continue;
    lastEnd = Math.max(lastEnd, Date.parse(plate.plannedEnd));
    const l = byPrinter.get(plate.printerId);
    if (l) l.push(plate);
    else byPrinter.set(plate.printerId, [plate]);
  }
  const from = new Date(now.getTime() - 6 * HOUR);
  const to = new Date(Math.min(lastEnd + 2 * HOUR, now.getTime() + 7 * 24 * HOUR));
  const cal = await cachedOpenIntervals(from, to);
  return {
    now: now.toISOString(),
    timezone: cal.timezone,
    window: { from: from.toISOString(), to: to.toISOString() },
    open: cal.open.map((i) => ({ from: new Date(i.start).toISOString(), to: new Date(i.end).toISOString() })),
    lanes: data.lanes.map((l) => ({ ...l, plates: byPrinter.get(l.id) ?? [] })),
    lastRunAt: data.lastRunAt,
    metrics: data.metrics,
    waiting: data.waiting,
  };
}
