// Finding 11 (issue 17): pages refused for a role answered 200 with a refusal inside. The shell's
// layout now checks each page's needs up front (lib/page-gates.ts); this keeps that table in step
// with the role each page checks itself.
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { describe, expect, it } from "vitest";
import { pageGate } from "@/lib/page-gates";

const root = path.join(process.cwd(), "app/(app)");

function pages(dir = root): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? pages(path.join(dir, e.name)) : e.name === "page.tsx" ? [path.join(dir, e.name)] : []));
}

describe("page gates", () => {
  it("name the same action as each page's own requirePageUser call", () => {
    const all = pages();
    expect(all.length).toBeGreaterThan(10);
    for (const file of all) {
      const route = "/" + path.relative(root, path.dirname(file)).replace(/\[[^\]]+\]/g, "7");
      const own = /requirePageUser\((?:"([a-z:-]+)"|undefined)/.exec(readFileSync(file, "utf8"));
      expect(own, `${file} calls requirePageUser`).not.toBeNull();
      expect(pageGate(route)?.action, route).toBe(own![1]);
    }
  });

  it("know which pages show one member's object", () => {
    expect(pageGate("/bench/assemblies/12")).toEqual({ resource: { kind: "assembly", id: "12" } });
    expect(pageGate("/bench/parts/x")).toEqual({ resource: { kind: "part", id: "x" } });
    expect(pageGate("/floor/")).toEqual({ action: "floor:view" });
    expect(pageGate("/sign-in")).toBeNull();
  });
});
