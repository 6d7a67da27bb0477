// Runs once when a Next server process starts (Node.js runtime): the socket-address rewrite for the
// sign-in throttle, the mail outbox worker, and a sweep (at start and every 10 minutes) of temporary
// upload files that a process killed mid-upload left behind.
export async function register() {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    // First: the throttle's client address comes from the socket, not from what a client wrote.
    const { installPeerAddress } = await import("@/lib/server/peer-address");
    installPeerAddress();
    const { startOutboxWorker } = await import("@/lib/server/mail/worker");
    startOutboxWorker();
    const { startTempSweeper, TEMP_MAX_AGE_MS } = await import("@/lib/server/storage/sweep");
    startTempSweeper({ onRemoved: (removed) => console.warn(`[platewright] removed ${removed.length} temporary upload file(s) older than ${TEMP_MAX_AGE_MS / 60_000} min`) });
  }
}
