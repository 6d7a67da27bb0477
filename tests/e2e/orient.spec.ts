// Orientation and split end to end: a member uploads a T that needs support standing up, ranks its
// orientations in the worker, picks one, plans a split, accepts it, and sees the pieces as parts.
import { expect, test } from "@playwright/test";
import { writeStl } from "../../lib/mesh";
import { loadWasm, tShape } from "../unit/orient/fixtures";
import { authFile } from "./helpers";

test.describe("orientation and split planner", () => {
  test.use({ storageState: authFile("member") });

  test("rank, pick, split and see the pieces as parts", async ({ page }) => {
    test.setTimeout(180_000);
    // Our own T: stem 10 × 10 × 30 under a 50 × 10 × 10 bar. Standing up, its two 20 mm arms overhang.
    const stl = writeStl(tShape(await loadWasm()));
    const name = `Shelf bracket ${Date.now().toString(36)}`;
    await page.goto("/bench");
    await page.getByLabel("Name", { exact: true }).fill(name);
    await page.getByRole("button", { name: "Create assembly" }).click();
    await expect(page.getByRole("heading", { level: 1, name })).toBeVisible();
    const assemblyUrl = page.url();
    await page.getByLabel("Mesh files").setInputFiles([{ name: "tee.stl", mimeType: "model/stl", buffer: Buffer.from(stl) }]);
    await page.getByRole("button", { name: "Upload tee.stl" }).click();
    await expect(page.getByRole("list", { name: "Files to upload" }).getByText("Uploaded and analysed.")).toBeVisible({ timeout: 30_000 });
    await page.reload();
    await page.getByRole("link", { name: "tee", exact: true }).click();
    await expect(page.getByTestId("orientation-in-use")).toContainText("file's own orientation");

    // Ranked orientations, side by side, each with its own 3D view.
    await page.getByRole("button", { name: "Find orientations" }).click();
    const ranked = page.getByRole("list", { name: "Ranked orientations" });
    await expect(ranked).toBeVisible({ timeout: 60_000 });
    const best = ranked.getByRole("listitem", { name: "Best" });
    // Hand-worked: lying on its big face the T needs no support at all (README score: support first).
    await expect(best.getByText("0 mm³")).toBeVisible();
    await expect(best.locator("canvas")).toBeVisible({ timeout: 20_000 });
    const own = ranked.getByRole("listitem", { name: "File's own orientation" });
    // Standing up: two arms 20 × 10 mm at 30 mm need 2 · 20 · 10 · 30 = 12,000 mm³ of support (box volume, hand-worked).
    await expect(own.getByText(/^1[12],\d{3} mm³$/)).toBeVisible();
    await best.getByRole("button", { name: "Use this" }).click();
    await expect(page.getByText("Orientation saved.")).toBeVisible();
    await expect(page.getByTestId("orientation-in-use")).toContainText("10 mm high (50 layers)");

    // Keep the file's own instead, where the arms need support, and plan a split there.
    await own.getByRole("button", { name: "Keep the file's own" }).click();
    await expect(page.getByTestId("orientation-in-use")).toContainText("file's own orientation");
    await page.getByRole("button", { name: "Plan a split" }).click();
    const splits = page.getByRole("table", { name: "Ranked splits" });
    await expect(splits).toBeVisible({ timeout: 90_000 });
    await expect(page.getByTestId("split-preview").locator("canvas")).toBeVisible({ timeout: 20_000 });
    await page.getByRole("button", { name: "Accept split" }).click();
    // The server re-cuts and stores the pieces; the part then says what it was split into.
    await expect(page.getByRole("list", { name: "Pieces" }).getByRole("link")).toHaveCount(2, { timeout: 60_000 });
    await page.reload();
    await expect(page.getByText("Split into 2 pieces", { exact: true })).toBeVisible();
    await expect(page.getByRole("button", { name: "Plan a split" })).toHaveCount(0);

    // The pieces are parts of the assembly, each with its own 3D view.
    await page.goto(assemblyUrl);
    await expect(page.getByRole("link", { name: /^tee – piece \d of 2$/ })).toHaveCount(2);
    await page.getByRole("link", { name: "tee – piece 1 of 2" }).click();
    await expect(page.locator('[data-testid="part-viewer"] canvas')).toBeVisible({ timeout: 20_000 });
    await expect(page.getByText(/^Cut from tee: glue the cut faces together\.$/)).toBeVisible();
  });
});
