// Printers, materials and quotes end to end: an admin adds a printer and a material in the pages;
// a member's quote changes when the printer's rate changes; the API refuses what a role may not do.
import { expect, test, type APIRequestContext } from "@playwright/test";
import { authFile } from "./helpers";

const suffix = () => Date.now().toString(36);

async function makePrinter(admin: APIRequestContext, name: string, rate: number) {
  const res = await admin.post("/api/printers", {
    data: { name, bedXMm: 200, bedYMm: 200, heightMm: 200, nozzleMm: 0.4, enclosed: false, hourlyRateCents: rate, materials: ["pla"] },
  });
  expect(res.status()).toBe(201);
  return (await res.json()) as { id: number; version: number } & Record<string, unknown>;
}

test.describe("as admin", () => {
  test.use({ storageState: authFile("admin") });

  test("adds a printer and a material in the pages", async ({ page }) => {
    const printer = `Magpie ${suffix()}`;
    await page.goto("/printers");
    await expect(page.getByRole("heading", { level: 1, name: "Printers" })).toBeVisible();
    const form = page.getByRole("form", { name: "Add a printer" });
    // An empty name is refused next to the field before anything is sent.
    await form.getByRole("button", { name: "Add printer" }).click();
    await expect(form.getByText("at least 2 characters")).toBeVisible();
    await form.getByLabel("Name").fill(printer);
    await form.getByLabel("Bed width (mm)").fill("200");
    await form.getByLabel("Bed depth (mm)").fill("210");
    await form.getByLabel("Build height (mm)").fill("190");
    await form.getByLabel("Hourly machine rate (cents)").fill("275");
    await form.getByLabel("PETG").check();
    await form.getByRole("button", { name: "Add printer" }).click();
    const card = page.getByRole("listitem", { name: printer });
    await expect(card).toBeVisible();
    await expect(card).toContainText("Bed 200 × 210 mm, height 190 mm");
    await expect(card).toContainText("PLA, PETG");
    await expect(card).toContainText("€2.75 / h");
    await expect(card.getByTestId("printer-state")).toHaveText(/Available/);

    const material = `Silk PLA ${suffix()}`;
    await page.goto("/materials");
    const mform = page.getByRole("form", { name: "Add a material" });
    await mform.getByLabel("Name").fill(material);
    await mform.getByLabel("Material type").selectOption("pla");
    // The reference density and its source are filled in from the material type.
    await expect(mform.getByLabel("Density (g/cm³)")).toHaveValue("1.24");
    await expect(mform.getByLabel("Density source")).toHaveValue(/NatureWorks/);
    await mform.getByLabel("Price per kg (cents)").fill("2900");
    await mform.getByRole("button", { name: "Add material" }).click();
    const mcard = page.getByRole("listitem", { name: material });
    await expect(mcard).toContainText("€29.00 per kg");
    await expect(mcard).toContainText("source: NatureWorks");
    // Seeded stock: ABS shows its cautions, and the low PLA spool is marked.
    await expect(page.getByRole("listitem", { name: "ABS", exact: true })).toContainText("ventilated room");
    await expect(page.getByRole("row", { name: "Spool KL-PLA-03" })).toContainText("Low stock");
  });
});

test.describe("as member", () => {
  test.use({ storageState: authFile("member") });

  test("sees a quote that changes when the printer's rate changes", async ({ page, browser }) => {
    const adminCtx = await browser.newContext({ storageState: authFile("admin") });
    const admin = adminCtx.request;
    const name = `Lark ${suffix()}`;
    const created = await makePrinter(admin, name, 300);

    const quote = async () => {
      await page.goto("/printers/quote");
      await page.getByLabel("Sample part").selectOption("clip");
      await page.getByRole("button", { name: "Get quote" }).click();
      const row = page.getByRole("row", { name: `Quote on ${name}` });
      await expect(row).toBeVisible();
      const cells = await row.getByRole("cell").allTextContents();
      return { material: cells[3], machine: cells[4], total: (await row.getByTestId("quote-total").textContent()) ?? "" };
    };
    const euros = (s: string) => Number(s.replace(/[^0-9.]/g, ""));

    const before = await quote();
    // The edit replaces every field the admin form has, with the version it was read at.
    const keys = ["name", "bedXMm", "bedYMm", "heightMm", "nozzleMm", "enclosed", "materials", "volumetricFlowMm3s", "perLayerSeconds", "startupMinutes"];
    const body = { ...Object.fromEntries(keys.map((k) => [k, created[k]])), hourlyRateCents: 1200, version: created.version };
    const res = await admin.patch(`/api/printers/${created.id}`, { data: body });
    expect(res.status()).toBe(200);

    const after = await quote();
    // Four times the rate: the machine line grows about fourfold (rounding to the cent aside),
    // the material line stays, and so the total goes up by the machine difference.
    expect(after.material).toBe(before.material);
    expect(euros(after.machine!)).toBeCloseTo(euros(before.machine!) * 4, 1);
    expect(euros(after.total)).toBeCloseTo(euros(before.total) + euros(after.machine!) - euros(before.machine!), 2);
    await adminCtx.close();
  });

  test("sees quotes on an assembly and on a part before submitting", async ({ page }) => {
    await page.goto("/bench");
    await page.getByRole("link", { name: "Camera slider" }).first().click();
    const whole = page.getByRole("region", { name: "Quote for the whole assembly" });
    await expect(whole.getByTestId("assembly-quote-total")).toHaveText(/€\d+\.\d\d/);
    await page.getByRole("link", { name: "Carriage plate" }).first().click();
    const one = page.getByRole("region", { name: "Quote for one copy" });
    await expect(one.getByTestId("quote-best")).toContainText(/From €\d+\.\d\d on /);
    // PETG: every printer in the seed takes it and a 90 × 70 × 8 mm plate fits them all.
    for (const n of ["Wren", "Heron", "Kestrel", "Osprey"]) await expect(one.getByRole("row", { name: `Quote on ${n}` })).toBeVisible();
  });

  test("the API refuses printer, price and hours changes (403) but answers quotes", async ({ request }) => {
    const printers = (await (await request.get("/api/printers")).json()) as { id: number }[];
    const id = printers[0]!.id;
    expect((await request.post("/api/printers", { data: { name: "Taken" } })).status()).toBe(403);
    expect((await request.patch(`/api/printers/${id}`, { data: { hourlyRateCents: 1 } })).status()).toBe(403);
    expect((await request.patch(`/api/printers/${id}/state`, { data: { state: "busy" } })).status()).toBe(403);
    expect((await request.delete(`/api/printers/${id}`)).status()).toBe(403);
    expect((await request.post("/api/materials", { data: { name: "Cheap" } })).status()).toBe(403);
    expect((await request.patch("/api/materials/1", { data: { pricePerKgCents: 1 } })).status()).toBe(403);
    expect((await request.get("/api/materials")).status()).toBe(403);
    expect((await request.put("/api/spools/1/load", { data: { printerId: id } })).status()).toBe(403);
    expect((await request.put("/api/workshop/hours", { data: { windows: [] } })).status()).toBe(403);
    const q = await request.post("/api/quotes", {
      data: { volumeMm3: 3600, areaMm2: 1560, heightMm: 10, layerHeightMm: 0.2, wallCount: 3, infillPercent: 15, material: "pla" },
    });
    expect(q.status()).toBe(200);
    expect(((await q.json()) as { options: unknown[] }).options.length).toBeGreaterThan(0);
    const bad = await request.post("/api/quotes", { data: { volumeMm3: -5, material: "pla" } });
    expect(bad.status()).toBe(422);
  });
});

test.describe("as operator", () => {
  test.use({ storageState: authFile("operator") });

  test("sets a printer's state but not its rate or a price", async ({ request, page }) => {
    const printers = (await (await request.get("/api/printers")).json()) as { id: number; name: string }[];
    const p = printers.find((x) => x.name === "Kestrel")!;
    const noNote = await request.patch(`/api/printers/${p.id}/state`, { data: { state: "maintenance", maintenanceNote: "" } });
    expect(noNote.status()).toBe(422);
    expect(((await noNote.json()) as { fieldErrors: Record<string, string[]> }).fieldErrors.maintenanceNote).toBeTruthy();
    const ok = await request.patch(`/api/printers/${p.id}/state`, {
      data: { state: "maintenance", maintenanceNote: "New build plate sheet", expectedBackAt: "2026-12-07T09:00:00+01:00" },
    });
    expect(ok.status()).toBe(200);
    expect((await request.patch(`/api/printers/${p.id}`, { data: { hourlyRateCents: 1 } })).status()).toBe(403);
    expect((await request.patch("/api/materials/1", { data: { pricePerKgCents: 1 } })).status()).toBe(403);
    expect((await request.put("/api/workshop/hours", { data: { windows: [] } })).status()).toBe(403);

    await page.goto("/printers");
    const card = page.getByRole("listitem", { name: "Kestrel" });
    await expect(card.getByTestId("printer-state")).toHaveText(/Under maintenance/);
    await expect(card).toContainText("New build plate sheet");
    await expect(card).toContainText("expected back Mon 7 Dec");
    // Back to available through the page.
    await card.getByLabel("Available").check();
    await card.getByRole("button", { name: "Set state" }).click();
    await expect(card.getByTestId("printer-state")).toHaveText(/Available/);
    // No admin controls for operators.
    await expect(page.getByRole("form", { name: "Add a printer" })).toHaveCount(0);
  });
});
