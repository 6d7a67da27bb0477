// Signs in once per role through the real form and saves the session for the other tests.
import { expect, test as setup } from "@playwright/test";
import { authFile, demo, signIn } from "./helpers";

for (const role of ["admin", "operator", "member", "member2"] as const) {
  setup(`sign in as ${role}`, async ({ page }) => {
    const u = demo(role);
    await signIn(page, u.email, u.password);
    await expect(page.getByTestId("whoami")).toContainText(u.name);
    await page.context().storageState({ path: authFile(role) });
  });
}
