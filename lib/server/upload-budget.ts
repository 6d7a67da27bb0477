import "server-only";

/**
 * Per-member upload budget, kept in this process (the app runs as one process per database): at most
 * MAX_COUNT uploads (those under way included) and MAX_BYTES bytes received in any WINDOW_MS. Past it
 * the upload is refused with 429 before a byte is read. Uploads under way are not capped on their own:
 * the analysis queues in the worker pool, so parallel uploads cost disk, not the request thread.
 * Figures are our own choice (common practice, no source): far above a member uploading an
 * assembly's parts by hand.
 */
export const UPLOAD_BUDGET = { MAX_COUNT: 100, MAX_BYTES: 2 * 1024 * 1024 * 1024, WINDOW_MS: 10 * 60_000 } as const;

interface Usage {
  running: number;
  done: { at: number; bytes: number }[];
}

export class UploadBudget {
  private readonly users = new Map<number, Usage>();
  constructor(
    private readonly limits: { MAX_COUNT: number; MAX_BYTES: number; WINDOW_MS: number } = UPLOAD_BUDGET,
    private readonly now: () => number = Date.now,
  ) {}

  private usage(userId: number): Usage {
    let u = this.users.get(userId);
    if (!u) this.users.set(userId, (u = { running: 0, done: [] }));
    const since = this.now() - this.limits.WINDOW_MS;
    while (u.done.length && u.done[0]!.at < since) u.done.shift();
    return u;
  }

  /**
   * Reserves one upload, or says how long to wait (seconds). The returned `finish(bytes)` must be
   * called once the upload has ended, however it ended, with the bytes received.
   */
  take(userId: number): { ok: true; finish: (bytes: number) => void } | { ok: false; retryAfterS: number; reason: string } {
    const u = this.usage(userId);
    const bytes = u.done.reduce((s, d) => s + d.bytes, 0);
    const oldest = u.done[0]?.at ?? this.now();
    const wait = Math.max(1, Math.ceil((oldest + this.limits.WINDOW_MS - this.now()) / 1000));
    if (u.done.length + u.running >= this.limits.MAX_COUNT) return { ok: false, retryAfterS: wait, reason: `you sent ${this.limits.MAX_COUNT} files in the last ${this.limits.WINDOW_MS / 60_000} minutes` };
    if (bytes >= this.limits.MAX_BYTES) return { ok: false, retryAfterS: wait, reason: `you sent ${Math.round(bytes / 1024 / 1024)} MB in the last ${this.limits.WINDOW_MS / 60_000} minutes` };
    u.running++;
    let finished = false;
    return {
      ok: true,
      finish: (received: number) => {
        if (finished) return;
        finished = true;
        u.running--;
        u.done.push({ at: this.now(), bytes: received });
      },
    };
  }
}

const g = globalThis as unknown as { __pwUploadBudget?: UploadBudget };
export const uploadBudget = (): UploadBudget => (g.__pwUploadBudget ??= new UploadBudget());
