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
