import type { Page } from "@playwright/test";
import { demoUsers } from "../../db/seed-data";

export function demo(role: "admin" | "operator" | "member" | "member2") {
  const members = demoUsers.filter((u) => u.role === "member");
  const u = role === "member" ? members[0] : role === "member2" ? members[1] : demoUsers.find((x) => x.role === role);
  if (!u) throw new Error(`no demo user for ${role}`);
  return u;
}

export const authFile = (role: string) => `tests/e2e/.auth/${role}.json`;

export async function signIn(page: Page, email: string, password: string) {
  await page.goto("/sign-in");
  await page.getByLabel("E-mail").fill(email);
  await page.getByLabel("Password").fill(password);
  await page.getByRole("button", { name: "Sign in" }).click();
}

/** Number of distinct colours in the WebGL canvas, read back through a 2D canvas. */
export async function canvasColours(page: Page): Promise<number> {
  return page.evaluate(() => {
    const c = document.querySelector<HTMLCanvasElement>('[data-testid="part-viewer"] canvas');
    if (!c) return 0;
    const t = document.createElement("canvas");
    t.width = c.width;
    t.height = c.height;
    const ctx = t.getContext("2d")!;
    ctx.drawImage(c, 0, 0);
    const d = ctx.getImageData(0, 0, t.width, t.height).data;
    const seen = new Set<number>();
    for (let i = 0; i < d.length; i += 4 * 7) seen.add((d[i]! << 16) | (d[i + 1]! << 8) | d[i + 2]!);
    return seen.size;
  });
}
