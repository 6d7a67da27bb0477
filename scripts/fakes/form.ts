// Decodes application/x-www-form-urlencoded bodies with bracketed keys (a[b][0][c]=1), the way the
// payment SDK encodes nested parameters. Numeric segments make arrays.
export type FormValue = string | FormValue[] | { [k: string]: FormValue };

export function parseForm(body: string): Record<string, FormValue> {
  const root: Record<string, FormValue> = {};
  for (const pair of body.split("&")) {
    if (!pair) continue;
    const eq = pair.indexOf("=");
    const rawKey = decodeURIComponent((eq < 0 ? pair : pair.slice(0, eq)).replace(/\+/g, " "));
    const value = eq < 0 ? "" : decodeURIComponent(pair.slice(eq + 1).replace(/\+/g, " "));
    const head = rawKey.split("[")[0] ?? rawKey;
    const rest = [...rawKey.slice(head.length).matchAll(/\[([^\]]*)\]/g)].map((m) => m[1] ?? "");
    const keys = [head, ...rest];
    let node: Record<string, FormValue> | FormValue[] = root;
    keys.forEach((k, i) => {
      const last = i === keys.length - 1;
      const container = node as Record<string, FormValue>;
      if (last) {
        container[k] = value;
        return;
      }
      const nextIsIndex = /^\d+$/.test(keys[i + 1] ?? "");
      container[k] ??= nextIsIndex ? [] : {};
      node = container[k] as Record<string, FormValue>;
    });
  }
  return root;
}

export function str(v: FormValue | undefined): string | undefined {
  return typeof v === "string" ? v : undefined;
}
