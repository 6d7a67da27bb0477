// Runs once when a Next server process starts: the mail outbox worker lives in the Node.js runtime.
export async function register() {
  if (process.env.NEXT_RUNTIME === "nodejs") {
    const { startOutboxWorker } = await import("@/lib/server/mail/worker");
    startOutboxWorker();
  }
}
