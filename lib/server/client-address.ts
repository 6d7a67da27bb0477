/**
 * The caller's address for throttling. Next fills X-Forwarded-For with the socket's address only when
 * the request has none, so a client could write its own. `installPeerAddress` (run from
 * instrumentation.ts) therefore rewrites the header of every request as it arrives, from the socket:
 * with TRUST_PROXY_HOPS=0 (no reverse proxy) it is the socket's address alone; behind N trusted
 * proxies the socket's address is appended and the entry N places before it is taken. It also stamps
 * each request with this process's own marker, so a request the rewrite did not see (one that arrived
 * before it was installed) counts as "unknown" rather than trusting what the client wrote.
 */
export const PEER_MARKER_HEADER = "x-platewright-peer";

const g = globalThis as unknown as { __pwPeerMarker?: string };

/** The marker of this process, made once (random; never leaves the process except in this header). */
export function peerMarker(): string {
  g.__pwPeerMarker ??= `${Date.now().toString(36)}.${Math.random().toString(36).slice(2)}${Math.random().toString(36).slice(2)}`;
  return g.__pwPeerMarker;
}

export function trustedHops(): number {
  const n = Number(process.env.TRUST_PROXY_HOPS ?? 0);
  return Number.isInteger(n) && n > 0 ? n : 0;
}

/** The X-Forwarded-For a request gets on arrival: what the client wrote counts only behind trusted proxies. */
export function forwardedForOnArrival(existing: string | string[] | undefined, socketAddress: string | undefined, hops: number): string {
  const socket = socketAddress || "unknown";
  const prior = Array.isArray(existing) ? existing.join(", ") : (existing ?? "");
  return hops > 0 && prior.trim() ? `${prior}, ${socket}` : socket;
}

/** The address to throttle by, from headers rewritten on arrival; "unknown" when they were not. */
export function clientAddress(headers: Record<string, unknown> | undefined, hops = trustedHops(), marker = peerMarker()): string {
  if (headers?.[PEER_MARKER_HEADER] !== marker) return "unknown";
  const fwd = headers?.["x-forwarded-for"];
  const list = typeof fwd === "string" ? fwd.split(",").map((s) => s.trim()).filter(Boolean) : [];
  return list[list.length - 1 - Math.max(0, Math.min(hops, list.length - 1))] ?? "unknown";
}
