// A change counter for this process's writes, for read caches that must never serve data older than
// a write this process has made (the Floor board, the attended calendar). Every statement sent through
// the app's pool is looked at: a write (INSERT, UPDATE, DELETE, REPLACE, DDL …) moves the counter
// when it has completed, or, inside a transaction, when the COMMIT or ROLLBACK has completed, so the
// counter has moved before the writer's own code goes on. A cache keeps the counter's value from
// before its read and throws the entry away as soon as the counter differs.
//
// Writes whose target is a table no cached read depends on (mail, sign-in throttling, payments …)
// and that name none of the tables those reads use do not move the counter, so the mail worker's
// claims do not empty the caches every few seconds. Anything not understood counts as a change.
import type mysql from "mysql2/promise";

/** Tables whose rows never reach a cached read, directly or through a cascading foreign key. */
const QUIET_TABLES = new Set([
  "mail_outbox",
  "mail_preferences",
  "sign_in_throttle",
  "invitations",
  "password_resets",
  "charges",
  "payments",
  "part_status_events",
  "part_files",
  "mesh_blobs",
  "part_orientations",
  "part_splits",
  "printer_materials",
  "printer_maintenance",
  "print_history",
  "assembly_items",
  "assembly_shares",
]);

/** Tables the cached reads use, or whose deletes cascade into them. A quiet write that names one still counts. */
const WATCHED = /\b(printers|spools|materials|plates|plate_items|queue_entries|part_instances|parts|users|planner_state|assemblies|attended_hours|workshop_settings)\b/i;

const WRITE = /^\s*(?:\/\*[\s\S]*?\*\/\s*)*(insert|update|delete|replace|truncate|alter|drop|create|rename|load|call|lock)\b/i;
const TARGET = /^\s*(?:(?:insert|replace)(?:\s+(?:low_priority|delayed|high_priority|ignore))*\s+(?:into\s+)?|update(?:\s+(?:low_priority|ignore))*\s+|delete(?:\s+(?:low_priority|quick|ignore))*\s+from\s+)`?(\w+)`?/i;
const END = /^\s*(commit|rollback)\b(?!\s+to\b)/i;

// On globalThis, like the pool: a bundler may load this module more than once in one process, and
// every copy must see the one counter that the pool's wrapper moves.
const state = globalThis as unknown as { __pwChangeGeneration?: number };
state.__pwChangeGeneration ??= 0;
const bump = () => {
  state.__pwChangeGeneration = (state.__pwChangeGeneration ?? 0) + 1;
};

/** The current value of the change counter. */
export function changeGeneration(): number {
  return state.__pwChangeGeneration ?? 0;
}

/** Moves the counter by hand (tests, or a write made outside the pool). */
export function noteChange(): void {
  bump();
}

function sqlText(arg: unknown): string {
  if (typeof arg === "string") return arg;
  if (arg && typeof arg === "object" && typeof (arg as { sql?: unknown }).sql === "string") return (arg as { sql: string }).sql;
  return "";
}

/** True when the statement may change what a cached read shows. */
export function changesWatchedData(sql: string): boolean {
  if (!WRITE.test(sql)) return false;
  const target = TARGET.exec(sql)?.[1]?.toLowerCase();
  if (target && QUIET_TABLES.has(target) && !WATCHED.test(sql)) return false;
  return true;
}

type Runner = (...args: unknown[]) => Promise<unknown>;

/**
 * Wraps `query` and `execute` of a pool or a pooled connection. A write moves the counter when it
 * completes; on a connection it also marks the connection, and its next COMMIT or ROLLBACK moves the
 * counter again once completed (the change becomes visible to other connections only then).
 */
function wrap(target: { query: Runner; execute: Runner }, conn: { dirty: boolean } | null): void {
  for (const name of ["query", "execute"] as const) {
    const run = target[name].bind(target);
    target[name] = (...args: unknown[]) => {
      const sql = sqlText(args[0]);
      const write = changesWatchedData(sql);
      const ending = conn !== null && END.test(sql);
      if (write && conn) conn.dirty = true;
      const after = () => {
        if (write) bump();
        if (ending && conn?.dirty) {
          bump();
          conn.dirty = false;
        }
      };
      return run(...args).then(
        (r) => {
          after();
          return r;
        },
        (e: unknown) => {
          after();
          throw e;
        },
      );
    };
  }
}

/** Installs the watch on the app's pool (once). */
export function watchWrites(pool: mysql.Pool): mysql.Pool {
  const p = pool as unknown as { query: Runner; execute: Runner; getConnection: () => Promise<unknown>; __pwWatched?: boolean };
  if (p.__pwWatched) return pool;
  p.__pwWatched = true;
  wrap(p, null);
  const getConnection = p.getConnection.bind(p);
  p.getConnection = async () => {
    const conn = (await getConnection()) as { query: Runner; execute: Runner };
    wrap(conn, { dirty: false });
    return conn;
  };
  return pool;
}
