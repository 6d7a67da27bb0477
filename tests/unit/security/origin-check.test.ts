// Finding 7 (issue 17): state-changing requests from another origin are refused.
// Browsers send Origin on every non-GET fetch and form post (Fetch Standard, "append a request
// `Origin` header") and Sec-Fetch-Site (W3C Fetch Metadata Request Headers) on every request.
import { describe, expect, it } from "vitest";
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { crossOriginRefusal } from "@/lib/origin-check";

function listRouteFiles(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? listRouteFiles(path.join(dir, e.name)) : e.name === "route.ts" ? [path.join(dir, e.name)] : []));
}

const allowed = ["http://127.0.0.1:3000"];
const h = (o: Record<string, string>) => new Headers(o);

describe("crossOriginRefusal", () => {
  it("refuses a form post or fetch from another origin on the same site", () => {
    expect(crossOriginRefusal("POST", h({ origin: "http://127.0.0.1:4252", "sec-fetch-site": "same-site" }), allowed)).toMatch(/127\.0\.0\.1:4252/);
    expect(crossOriginRefusal("DELETE", h({ origin: "https://evil.example" }), allowed)).not.toBeNull();
    expect(crossOriginRefusal("PUT", h({ origin: "null" }), allowed)).toMatch(/opaque/);
    expect(crossOriginRefusal("PATCH", h({ "sec-fetch-site": "cross-site" }), allowed)).not.toBeNull();
    expect(crossOriginRefusal("POST", h({ "sec-fetch-site": "same-site" }), allowed)).not.toBeNull();
  });

  it("lets our own pages, safe methods and non-browser clients through", () => {
    expect(crossOriginRefusal("POST", h({ origin: "http://127.0.0.1:3000", "sec-fetch-site": "same-origin" }), allowed)).toBeNull();
    expect(crossOriginRefusal("POST", h({ "sec-fetch-site": "same-origin" }), allowed)).toBeNull();
    expect(crossOriginRefusal("GET", h({ origin: "https://evil.example" }), allowed)).toBeNull();
    expect(crossOriginRefusal("POST", h({}), allowed)).toBeNull();
  });

  it("is the first statement of every state-changing route handler but next-auth's and the webhook's", () => {
    const files = listRouteFiles(path.join(process.cwd(), "app/api")).filter((f) => !/\/api\/(auth|webhooks)\//.test(f));
    let handlers = 0;
    for (const file of files) {
      const src = readFileSync(file, "utf8");
      for (const m of src.matchAll(/export async function (POST|PUT|PATCH|DELETE)\((\w+)/g)) {
        handlers++;
        const body = src.slice(src.indexOf("try {", m.index) + 5);
        expect(body.trimStart().split(";")[0], `${file} ${m[1]}`).toBe(`assertSameOrigin(${m[2]})`);
      }
      const declared = [...src.matchAll(/export async function (POST|PUT|PATCH|DELETE)\b/g)].length;
      expect([...src.matchAll(/assertSameOrigin\(/g)].length, file).toBe(declared);
    }
    expect(handlers).toBeGreaterThan(30);
  });
});
