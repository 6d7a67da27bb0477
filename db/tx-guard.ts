import { AsyncLocalStorage } from "node:async_hooks";

/**
 * One connection per transaction: code running inside `db().transaction(fn)` must use the `tx` it
 * was given, never the pool. A pool call from inside waits for a second connection while holding the
 * first, and once every pool connection is held by requests waiting on the same row lock, nothing
 * moves until the lock wait times out. This guard marks the transaction's callback (and everything it
 * awaits) and refuses a pool call made from there: it throws outside production (so every test that
 * reaches such a path fails) and logs the stack in production.
 */
const scope = new AsyncLocalStorage<{ open: boolean }>();

export class PoolInTransactionError extends Error {
  constructor(method: string) {
    super(`pool.${method}() was called inside a transaction: pass the transaction (tx) down to every read and write inside it`);
    this.name = "PoolInTransactionError";
  }
}

const strict = () => process.env.NODE_ENV !== "production" || process.env.PW_TX_GUARD === "throw";

/** True while the current async context runs inside a transaction callback. */
export function insideTransaction(): boolean {
  return scope.getStore()?.open === true;
}

function check(method: string): void {
  if (!insideTransaction()) return;
  const err = new PoolInTransactionError(method);
  if (strict()) throw err;
  console.error("[platewright]", err.stack);
}

/** Runs `fn` as if outside any transaction: for tests that stand in for another request on purpose. */
export function outsideTransaction<T>(fn: () => T): T {
  return scope.exit(fn);
}

type Fn = (...args: unknown[]) => unknown;

/** Wraps the pool's query, execute and getConnection with the check (once). */
export function guardPool<P extends object>(pool: P): P {
  const p = pool as unknown as Record<string, Fn> & { __pwGuarded?: boolean };
  if (p.__pwGuarded) return pool;
  p.__pwGuarded = true as never;
  for (const name of ["query", "execute", "getConnection"]) {
    const run = p[name]!.bind(p);
    p[name] = (...args: unknown[]) => {
      check(name);
      return run(...args);
    };
  }
  return pool;
}

/** Marks the callbacks of `db.transaction` so that pool calls from inside them are caught. */
export function guardTransactions<D extends { transaction: (...a: never[]) => unknown }>(d: D): D {
  const orig = d.transaction.bind(d) as unknown as (fn: (tx: unknown) => unknown, config?: unknown) => unknown;
  (d as unknown as { transaction: unknown }).transaction = (fn: (tx: unknown) => unknown, config?: unknown) =>
    orig((tx) => {
      // Work the callback started that outlives it (a timer, an unawaited promise) inherits this
      // context; once the callback has settled it is no longer inside the transaction.
      const store = { open: true };
      return scope.run(store, async () => {
        try {
          return await fn(tx);
        } finally {
          store.open = false;
        }
      });
    }, config);
  return d;
}
