import "server-only";
import { outsideTransaction } from "@/db/tx-guard";
import { env } from "@/lib/env";
import { drainOutbox } from "./outbox";

interface WorkerState {
  timer: ReturnType<typeof setInterval>;
  busy: boolean;
  again: boolean;
}

const g = globalThis as unknown as { __pwOutboxWorker?: WorkerState };

async function tick(state: WorkerState): Promise<void> {
  if (state.busy) {
    state.again = true;
    return;
  }
  state.busy = true;
  try {
    do {
      state.again = false;
      const r = await drainOutbox();
      if (r.retrying || r.failed) console.warn(`[platewright] outbox: ${r.sent} sent, ${r.retrying} to retry, ${r.failed} failed`);
    } while (state.again);
  } catch (e) {
    // The database may be restarting: the next tick tries again, nothing is lost.
    console.error("[platewright] outbox worker:", e instanceof Error ? e.message : e);
  } finally {
    state.busy = false;
  }
}

/** Starts the outbox loop once per server process (from instrumentation.ts). */
export function startOutboxWorker(): void {
  if (g.__pwOutboxWorker) return;
  const state: WorkerState = { busy: false, again: false, timer: undefined as unknown as ReturnType<typeof setInterval> };
  state.timer = setInterval(() => void tick(state), env().MAIL_OUTBOX_INTERVAL_MS);
  state.timer.unref?.();
  g.__pwOutboxWorker = state;
  void tick(state);
}

/**
 * Asks a running worker to look at the outbox now; does nothing where no worker runs (tests, scripts).
 * Often called inside a transaction (notify with `tx`): the timer is made outside it, so the worker's
 * own queries are not taken for pool calls from inside that transaction (db/tx-guard.ts).
 */
export function kickOutbox(): void {
  const state = g.__pwOutboxWorker;
  if (state) outsideTransaction(() => setTimeout(() => void tick(state), 0));
}

export function stopOutboxWorker(): void {
  const state = g.__pwOutboxWorker;
  if (state) clearInterval(state.timer);
  g.__pwOutboxWorker = undefined;
}
