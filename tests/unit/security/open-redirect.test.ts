// Finding 2 (issue 17): the callback after sign-in must stay on our origin.
// Browsers treat "/\host" and "/<tab>/host" like "//host" (WHATWG URL Standard, "special" schemes:
// a backslash is a path separator, and tab/newline are removed before parsing), so the value is
// parsed with the URL parser itself, the same one the browser uses.
import { describe, expect, it } from "vitest";
import { sameOriginPath } from "@/lib/safe-redirect";

const origin = "http://127.0.0.1:3000";

describe("sameOriginPath", () => {
  it("refuses every form the red-team pass used, and the usual others", () => {
    for (const attack of ["/\\127.0.0.1:4252/", decodeURIComponent("%2F%09%2F127.0.0.1:4252/"), "//evil.example/x", "/\t/evil.example", "\\\\evil.example", "http://evil.example/", "https://127.0.0.1:3000/", "javascript:alert(1)", "data:text/html,x", "http://127.0.0.1:4252/ledger"]) {
      expect(sameOriginPath(attack, origin), attack).toBe("/");
      // The browser's own reading (the URL parser) agrees that each lands elsewhere or nowhere useful.
      expect(new URL(attack, origin).origin === origin && attack.startsWith("/") && !attack.startsWith("//") && !attack.startsWith("/\\") && !attack.includes("\t")).toBe(false);
    }
  });

  it("keeps paths on our origin, normalised", () => {
    expect(sameOriginPath("/ledger?checkout=abc#top", origin)).toBe("/ledger?checkout=abc#top");
    expect(sameOriginPath("/bench/assemblies/3", origin)).toBe("/bench/assemblies/3");
    expect(sameOriginPath("http://127.0.0.1:3000/floor", origin)).toBe("/floor");
    expect(sameOriginPath("floor", origin)).toBe("/floor");
    expect(sameOriginPath("/a/../b", origin)).toBe("/b");
    expect(sameOriginPath(undefined, origin)).toBe("/");
    expect(sameOriginPath("", origin)).toBe("/");
  });

  it("the old rule (leading '/' but not '//') let the attacks through", () => {
    const old = (v: string) => v.startsWith("/") && !v.startsWith("//");
    expect(old("/\\127.0.0.1:4252/")).toBe(true);
    expect(new URL("/\\127.0.0.1:4252/", origin).origin).toBe("http://127.0.0.1:4252");
    expect(new URL("/\t/127.0.0.1:4252/", origin).origin).toBe("http://127.0.0.1:4252");
  });
});
