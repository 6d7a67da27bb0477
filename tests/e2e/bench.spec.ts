// The Bench end to end: an assembly with a sub-assembly, two uploads with progress, the 3D view,
// figures equal to lib/mesh's own (the analyse CLI prints the same analysisToJson record), a hardware
// item, the bill of materials, and sharing with a second member.
import { expect, test } from "@playwright/test";
import { readFile } from "node:fs/promises";
import { analysisToJson, analyzeBytes, write3mf, writeStl } from "../../lib/mesh";
import { box, concat, prism, translate } from "../fixtures/meshes";
import { authFile, demo, canvasColours } from "./helpers";

// Our own generated parts: a perch (box with a peg) as binary STL and a roof panel as 3MF.
const stl = writeStl(concat(box(40, 30, 20), translate(prism(12, 5, 15), [20, 15, 20])));
const threeMf = write3mf([{ name: "roof panel", mesh: box(60, 45, 4) }]);

test.describe("the Bench", () => {
  test.use({ storageState: authFile("member") });

  test("assembly, uploads, 3D view, figures, hardware, BOM and sharing", async ({ page, browser }) => {
    test.setTimeout(120_000);
    const name = `Bird feeder ${Date.now().toString(36)}`;
    await page.goto("/bench");
    await page.getByLabel("Name", { exact: true }).fill(name);
    await page.getByRole("button", { name: "Create assembly" }).click();
    await expect(page.getByRole("heading", { level: 1, name })).toBeVisible();
    const assemblyUrl = page.url();
    const assemblyId = Number(assemblyUrl.split("/").pop());

    await page.getByLabel("Sub-assembly name").fill("Roof");
    await page.getByRole("button", { name: "Add sub-assembly" }).click();
    await expect(page.getByRole("link", { name: "Roof" })).toBeVisible();

    await page.getByLabel("Mesh files").setInputFiles([
      { name: "perch.stl", mimeType: "model/stl", buffer: Buffer.from(stl) },
      { name: "roof-panel.3mf", mimeType: "model/3mf", buffer: Buffer.from(threeMf) },
    ]);
    const rows = page.getByRole("list", { name: "Files to upload" });
    await expect(rows.getByText("40.0 × 30.0 × 35.0 mm")).toBeVisible(); // read in the worker before sending
    await page.getByRole("button", { name: "Upload all (2)" }).click();
    await expect(page.getByRole("progressbar", { name: "Upload of perch.stl" })).toBeVisible();
    await expect(page.getByRole("progressbar", { name: "Upload of roof-panel.3mf" })).toBeVisible();
    await expect(rows.getByText("Uploaded and analysed.")).toHaveCount(2);

    // Hardware item.
    await page.getByLabel("Item name").fill("M3 heat-set insert");
    await page.getByLabel("Item quantity").fill("6");
    await page.getByRole("button", { name: "Add item" }).click();
    await expect(page.getByRole("cell", { name: "M3 heat-set insert" })).toBeVisible();

    // Bill of materials as CSV.
    const [download] = await Promise.all([page.waitForEvent("download"), page.getByRole("link", { name: /Export bill of materials/ }).click()]);
    const csv = await readFile((await download.path())!, "utf8");
    expect(csv.split("\r\n")[0]).toBe("Type,Name,Sub-assembly,Quantity,Material or source,Colour,Status,Unit price (cents),Due date,Size as printed (mm)");
    expect(csv).toContain("printed part,perch,");
    expect(csv).toContain("printed part,roof panel,");
    expect(csv).toContain("bought hardware,M3 heat-set insert,");

    // The part page: figures equal to lib/mesh's, and a 3D view that is not blank.
    await page.getByRole("link", { name: "perch", exact: true }).click();
    await expect(page.getByRole("heading", { level: 1, name: "perch" })).toBeVisible();
    const direct = analysisToJson("perch.stl", "stl-binary", analyzeBytes(stl, { filename: "perch.stl" }).analysis);
    for (const key of ["volume_mm3", "area_mm2", "overhang_area_mm2", "bed_contact_area_mm2", "footprint_area_mm2", "triangles", "boundary_edges"] as const) {
      await expect(page.locator(`[data-key="${key}"]`)).toHaveAttribute("data-value", String(direct[key]));
    }
    await expect(page.locator('[data-key="size"]')).toHaveAttribute("data-value", direct.size.join(","));
    await expect(page.locator('[data-testid="part-viewer"] canvas')).toBeVisible({ timeout: 20_000 });
    await expect.poll(() => canvasColours(page), { timeout: 20_000 }).toBeGreaterThan(8);
    await page.locator('[data-testid="part-viewer"]').screenshot({ path: "test-results/bench-part-viewer.png" });

    // A second member cannot see it until it is shared.
    const other = await browser.newContext({ storageState: authFile("member2") });
    const otherPage = await other.newPage();
    expect((await otherPage.request.get(`/api/assemblies/${assemblyId}`)).status()).toBe(404);
    await otherPage.goto(assemblyUrl);
    await expect(otherPage.getByText("No such assembly, or it is not shared with you")).toBeVisible();

    await page.goto(assemblyUrl);
    await page.getByLabel("Member's e-mail").fill(demo("member2").email);
    await page.getByRole("button", { name: "Share", exact: true }).click();
    await expect(page.getByRole("list", { name: "Shared with" })).toContainText(demo("member2").name);

    expect((await otherPage.request.get(`/api/assemblies/${assemblyId}`)).status()).toBe(200);
    await otherPage.goto(assemblyUrl);
    await expect(otherPage.getByRole("heading", { level: 1, name })).toBeVisible();
    await expect(otherPage.getByText("shared with you to read")).toBeVisible();
    await other.close();
  });
});
