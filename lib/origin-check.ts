/**
 * The origin rule for state-changing requests. A browser names the page that sent a request in
 * `Origin` (every non-GET fetch and form post) and says how it relates to the target in
 * `Sec-Fetch-Site`. A request from another origin, even on the same site (another port of the same
 * host shares our cookies), is refused. A request with neither header does not come from a browser,
 * so it carries no visitor's cookies by accident and is left to the route's own checks.
 */
const SAFE = new Set(["GET", "HEAD", "OPTIONS"]);

export interface HeaderSource {
  get(name: string): string | null;
}

/** Why a request must be refused, or null when it may go on. `allowed` holds our own origins. */
export function crossOriginRefusal(method: string, headers: HeaderSource, allowed: readonly string[]): string | null {
  if (SAFE.has(method.toUpperCase())) return null;
  const origin = headers.get("origin");
  if (origin !== null) {
    if (origin !== "null" && allowed.includes(origin.toLowerCase())) return null;
    return `Requests that change data must come from this site's own pages (this one came from ${origin === "null" ? "an opaque origin" : origin}).`;
  }
  const site = headers.get("sec-fetch-site");
  if (site !== null && site !== "same-origin" && site !== "none") {
    return `Requests that change data must come from this site's own pages (this one was ${site}).`;
  }
  return null;
}

/** Lower-case origin of a URL string, or null. */
export function originOf(url: string | undefined | null): string | null {
  if (!url) return null;
  try {
    return new URL(url).origin.toLowerCase();
  } catch {
    return null;
  }
}
