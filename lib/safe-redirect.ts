/**
 * Where to send the browser after sign-in: only a place on our own origin. The value is parsed the
 * way a browser parses it (`/\host`, `/<tab>/host` and `//host` all name another host), and what
 * comes back is the normalised path, query and fragment, never the raw text. Anything else is "/".
 */
export function sameOriginPath(value: string | null | undefined, origin: string): string {
  if (!value) return "/";
  let base: URL;
  try {
    base = new URL(origin);
  } catch {
    return "/";
  }
  let url: URL;
  try {
    url = new URL(value, base);
  } catch {
    return "/";
  }
  if (url.origin !== base.origin) return "/";
  return `${url.pathname}${url.search}${url.hash}`;
}
