// Finding 10 (issue 17): with the database down the sign-in form showed SQL text ("Failed query:
// select … params: account:…"). The message next-auth passes to the form is now plain words. The
// database is "down" here for real: the pool points at a loopback port nothing listens on.
import net from "node:net";
import { describe, expect, it } from "vitest";

const closedPort = await new Promise<number>((resolve) => {
  const s = net.createServer().listen(0, "127.0.0.1", () => {
    const port = (s.address() as net.AddressInfo).port;
    s.close(() => resolve(port));
  });
});
process.env.DB_PORT = String(closedPort);
process.env.DB_NAME = "platewright_test_nothing_here";

const { authOptions } = await import("@/lib/server/auth");
const { closeDb } = await import("@/db");

describe("sign-in with the database down", () => {
  it("says so in plain words, without SQL or the e-mail address", async () => {
    const provider = authOptions.providers[0] as unknown as { options: { authorize: (raw: unknown, req: unknown) => Promise<unknown> } };
    const err = await provider.options.authorize({ email: "jun@kettlelane.example", password: "anything at all" }, { headers: {} }).then(
      () => null,
      (e: unknown) => e as Error,
    );
    await closeDb();
    expect(err?.message).toBe("Signing in is not possible right now: the database is not reachable. Try again shortly.");
    expect(err?.message).not.toMatch(/select|params|account:|kettlelane/i);
  });
});
