// STEP end to end: a STEP file (drawn in inches, written by tests/fixtures/step.ts) is tessellated in
// the browser's mesh worker for its preview, uploaded, tessellated again on the server; the part page
// shows the same figures as the CLI (lib/mesh-node analyzeFile) and draws it in the 3D view; the
// original STEP and the 3MF made from it can both be downloaded.
import { expect, test } from "@playwright/test";
import { readFile } from "node:fs/promises";
import { analysisToJson } from "../../lib/mesh";
import { analyzeFile } from "../../lib/mesh-node/step";
import { boxSolid, cylinderSolid, stepFile } from "../fixtures/step";
import { authFile, canvasColours } from "./helpers";

const step = new TextEncoder().encode(stepFile("in", (w) => [boxSolid(w, 1, 2, 0.5), cylinderSolid(w, 0.25, 1, [2, 0, 0])]));

test.describe("STEP import", () => {
  test.use({ storageState: authFile("member") });

  test("upload a STEP file: worker preview, server figures equal the CLI's, 3D view, both downloads", async ({ page }) => {
    test.setTimeout(120_000);
    const cli = analysisToJson("lamp-bracket.step", "step", (await analyzeFile(step)).analysis);
    const name = `Lamp ${Date.now().toString(36)}`;
    await page.goto("/bench");
    await page.getByLabel("Name", { exact: true }).fill(name);
    await page.getByRole("button", { name: "Create assembly" }).click();
    await expect(page.getByRole("heading", { level: 1, name })).toBeVisible();

    await page.getByLabel("Mesh files").setInputFiles([{ name: "lamp-bracket.step", mimeType: "model/step", buffer: Buffer.from(step) }]);
    const rows = page.getByRole("list", { name: "Files to upload" });
    // The preview comes from the mesh worker's own tessellation (the WebAssembly loaded in the worker).
    await expect(rows.getByText(`${cli.size.map((x) => x.toFixed(1)).join(" × ")} mm · ${cli.triangles} triangles`)).toBeVisible({ timeout: 30_000 });
    await expect(rows.getByLabel("Units of lamp-bracket.step")).toHaveCount(0); // STEP states its own unit
    await page.getByRole("button", { name: "Upload lamp-bracket.step" }).click();
    await expect(rows.getByText("Uploaded and analysed.")).toBeVisible({ timeout: 30_000 });

    await page.getByRole("link", { name: "lamp bracket", exact: true }).click();
    await expect(page.getByRole("heading", { level: 1, name: "lamp bracket" })).toBeVisible();
    for (const key of ["volume_mm3", "area_mm2", "overhang_area_mm2", "bed_contact_area_mm2", "footprint_area_mm2", "triangles", "boundary_edges"] as const) {
      await expect(page.locator(`[data-key="${key}"]`)).toHaveAttribute("data-value", String(cli[key]));
    }
    await expect(page.locator('[data-key="size"]')).toHaveAttribute("data-value", cli.size.join(","));
    await expect(page.locator('[data-testid="part-viewer"] canvas')).toBeVisible({ timeout: 20_000 });
    await expect.poll(() => canvasColours(page), { timeout: 20_000 }).toBeGreaterThan(8);
    await page.locator('[data-testid="part-viewer"]').screenshot({ path: "test-results/step-part-viewer.png" });

    // The original STEP and the 3MF made from it.
    const [source] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "lamp-bracket.step" }).click()]);
    expect(new Uint8Array(await readFile((await source.path())!))).toEqual(step);
    const [mesh] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: "3MF" }).click()]);
    expect(mesh.suggestedFilename()).toBe("lamp-bracket.3mf");

    // Only the worker entry scripts may evaluate strings (the tessellator's bindings need it); pages may not.
    expect((await page.request.get("/bench")).headers()["content-security-policy"]).not.toContain("'unsafe-eval'");

  });
});
