// Finding 7 (issue 17): state-changing requests from another origin are refused.
// Browsers send Origin on every non-GET fetch and form post (Fetch Standard, "append a request
// `Origin` header") and Sec-Fetch-Site (W3C Fetch Metadata Request Headers) on every request.
import { describe, expect, it } from "vitest";
import { crossOriginRefusal, originRuleApplies } from "@/lib/origin-check";

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

  it("applies to API routes except next-auth's and the signed webhook", () => {
    expect(originRuleApplies("/api/plan")).toBe(true);
    expect(originRuleApplies("/api/payments/checkout")).toBe(true);
    expect(originRuleApplies("/api/auth/callback/credentials")).toBe(false);
    expect(originRuleApplies("/api/webhooks/payments")).toBe(false);
  });
});
