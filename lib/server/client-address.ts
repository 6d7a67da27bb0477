/**
 * The caller's address for throttling. The Next server appends the socket's address to
 * X-Forwarded-For, so the last entry is the one a client cannot forge; behind N trusted reverse
 * proxies, set TRUST_PROXY_HOPS=N to take the entry N places before it.
 */
export function clientAddress(headers: Record<string, unknown> | undefined, hops = Number(process.env.TRUST_PROXY_HOPS ?? 0)): string {
  const fwd = headers?.["x-forwarded-for"];
  const list = typeof fwd === "string" ? fwd.split(",").map((s) => s.trim()).filter(Boolean) : [];
  return list[list.length - 1 - Math.max(0, Math.min(hops, list.length - 1))] ?? "unknown";
}
