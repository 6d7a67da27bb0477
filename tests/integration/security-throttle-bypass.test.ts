// Finding 6 (issue 17): the sign-in throttle could be bypassed with a forged X-Forwarded-For and
// raced with parallel guesses (forty parallel guesses checked twelve passwords).
import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db";
import { clientAddress, forwardedForOnArrival, PEER_MARKER_HEADER, peerMarker } from "@/lib/server/client-address";
import { takeAttempt } from "@/lib/server/throttle";

afterAll(closeDb);

describe("the client address", () => {
  const arrived = (xff: string | undefined, socket: string, hops: number) => ({ "x-forwarded-for": forwardedForOnArrival(xff, socket, hops), [PEER_MARKER_HEADER]: peerMarker() });

  it("is the socket's address without trusted proxies, whatever the client wrote", () => {
    expect(clientAddress(arrived("203.0.113.9", "127.0.0.1", 0), 0)).toBe("127.0.0.1");
    expect(clientAddress(arrived("203.0.113.9, 198.51.100.1", "::1", 0), 0)).toBe("::1");
    expect(clientAddress(arrived(undefined, "127.0.0.1", 0), 0)).toBe("127.0.0.1");
  });

  it("behind N trusted proxies, is the entry N places before the socket's", () => {
    // The proxy (socket 10.0.0.2) appended the real client 198.51.100.7 after what the client wrote.
    expect(clientAddress(arrived("203.0.113.9, 198.51.100.7", "10.0.0.2", 1), 1)).toBe("198.51.100.7");
  });

  it("is 'unknown' for headers not rewritten on arrival (a forged header is never read)", () => {
    expect(clientAddress({ "x-forwarded-for": "203.0.113.9" }, 0)).toBe("unknown");
    expect(clientAddress({ "x-forwarded-for": "203.0.113.9", [PEER_MARKER_HEADER]: "guessed" }, 0)).toBe("unknown");
  });
});

describe("the attempt counter", () => {
  it("lets at most five of forty parallel guesses reach the password check", async () => {
    const key = `account:race-${Date.now()}@example.org`;
    const waits = await Promise.all(Array.from({ length: 40 }, () => takeAttempt(key)));
    expect(waits.filter((w) => w === 0).length).toBe(5);
    expect(waits.filter((w) => w > 0).length).toBe(35);
  });
});
