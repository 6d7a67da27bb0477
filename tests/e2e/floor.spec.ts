// The workshop loop end to end: a member sends a part, the operator re-plans, starts the plate and
// marks it finished, the member sees the copy printed with its shelf; a failed plate sends its copies
// back to the queue; the plate's 3MF opens with the mesh engine's reader and holds one object per copy.
import { expect, test, type APIRequestContext, type Page } from "@playwright/test";
import { readMesh } from "../../lib/mesh";
import { authFile, demo } from "./helpers";

async function partPage(page: Page, name: string) {
  await page.goto("/bench/parts");
  await page.getByRole("link", { name }).first().click();
  await expect(page.getByRole("heading", { name: "In the workshop" })).toBeVisible();
}

/** Clears the plate's printer: finishes whatever it is printing and loads a spool of the plate's family. */
async function readyPrinter(api: APIRequestContext, plateId: number) {
  const plate = (await (await api.get(`/api/plates/${plateId}`)).json()) as { plate: { printerId: number; material: string; colour: string } };
  const board = (await (await api.get("/api/queue/board")).json()) as { lanes: { id: number; plates: { id: number; status: string; version: number }[] }[] };
  for (const p of board.lanes.find((l) => l.id === plate.plate.printerId)?.plates ?? []) {
    if (p.status === "printing") await api.post(`/api/plates/${p.id}/finish`, { data: { version: p.version, actualMinutes: 30, shelfLabel: "Shelf Z9" } });
  }
  const mats = (await (await api.get("/api/materials")).json()) as { type: string; spools: { id: number; gramsRemaining: number; colour: string }[] }[];
  // The plate's colour too: Start checks both.
  const spool = mats.filter((m) => m.type === plate.plate.material).flatMap((m) => m.spools).filter((x) => x.colour.toLowerCase() === plate.plate.colour).sort((a, b) => b.gramsRemaining - a.gramsRemaining)[0];
  if (spool) await api.put(`/api/spools/${spool.id}/load`, { data: { printerId: plate.plate.printerId } });
}

async function plateOfCopy(page: Page): Promise<number> {
  const link = page.getByRole("table", { name: "Copies in the workshop" }).getByRole("link", { name: /Plate \d+/ }).first();
  await expect(link).toBeVisible({ timeout: 20_000 });
  return Number((await link.textContent())!.replace(/\D+/g, ""));
}

test("send, re-plan, start, finish; the member sees it printed; a failure goes back to the queue; 3MF reads back", async ({ browser }) => {
  test.setTimeout(240_000); // a long walk through two plates on a shared, busy machine
  const startedAt = Date.now() - 1000;
  const member = await browser.newPage({ storageState: authFile("member") });
  const operatorCtx = await browser.newContext({ storageState: authFile("operator") });
  const operator = await operatorCtx.newPage();

  await partPage(member, "Controller lid");
  await member.getByRole("spinbutton", { name: "Copies" }).fill("1");
  await member.getByRole("button", { name: "Send to the workshop" }).click();
  await expect(member.getByText("Sent 1 copy.")).toBeVisible();

  await operator.goto("/floor");
  await operator.getByRole("button", { name: "Re-plan" }).click();
  await expect(operator.getByText(/Planned \d+ copies on \d+ plates/)).toBeVisible({ timeout: 30_000 });

  await member.reload();
  const plateId = await plateOfCopy(member);
  await readyPrinter(operatorCtx.request, plateId);

  // The download opens with lib/mesh's reader: one object per copy on the plate.
  const res = await operatorCtx.request.get(`/api/plates/${plateId}/3mf`);
  expect(res.ok()).toBe(true);
  const back = readMesh(new Uint8Array(await res.body()), { filename: "plate.3mf" });
  const detail = (await (await operatorCtx.request.get(`/api/plates/${plateId}`)).json()) as { items: unknown[] };
  expect(back.parts?.length).toBe(detail.items.length);

  await operator.goto(`/plates/${plateId}`);
  await expect(operator.getByRole("heading", { name: "Bed from above" })).toBeVisible();
  await operator.getByRole("button", { name: "Start" }).click();
  await operator.getByRole("button", { name: "Confirm: start" }).click();
  await expect(operator.getByText(/^Printing ·/)).toBeVisible({ timeout: 15_000 });
  await operator.getByRole("button", { name: "Mark finished" }).click();
  await operator.getByLabel("Where the parts wait").fill("Shelf C3");
  await operator.getByRole("button", { name: "Confirm: mark finished" }).click();
  await expect(operator.getByText("Finished: the parts wait at Shelf C3")).toBeVisible({ timeout: 15_000 });

  await member.reload();
  const table = member.getByRole("table", { name: "Copies in the workshop" });
  await expect(table.getByText("Shelf C3")).toBeVisible({ timeout: 15_000 });
  await expect(table.getByText("Printed").first()).toBeVisible();

  // The member is told: the outbox delivers "printed and ready to collect" to the fake mailbox.
  const admin = await browser.newContext({ storageState: authFile("admin") });
  await expect
    .poll(
      async () => {
        const res = await admin.request.get(`/api/mail/mailbox?to=${encodeURIComponent(demo("member").email)}`);
        const msgs = (await res.json()) as { subject: string; receivedAt: string; text: string }[];
        return msgs.some((m) => m.subject === "Printed and ready to collect: Controller lid" && Date.parse(m.receivedAt) >= startedAt && m.text.includes("Shelf C3"));
      },
      { timeout: 60_000, intervals: [1000] },
    )
    .toBe(true);
  await admin.close();

  // A second part, failed on the printer: its copy is back in the queue with a reprint counted.
  await partPage(member, "Motor end cap");
  await member.getByRole("spinbutton", { name: "Copies" }).fill("1");
  await member.getByRole("button", { name: "Send to the workshop" }).click();
  await expect(member.getByText("Sent 1 copy.")).toBeVisible();
  await operator.goto("/floor");
  await operator.getByRole("button", { name: "Re-plan" }).click();
  await expect(operator.getByText(/Planned \d+ copies/)).toBeVisible({ timeout: 30_000 });
  await member.reload();
  const second = await plateOfCopy(member);
  await readyPrinter(operatorCtx.request, second);
  await operator.goto(`/plates/${second}`);
  await operator.getByRole("button", { name: "Start" }).click();
  await operator.getByRole("button", { name: "Confirm: start" }).click();
  await expect(operator.getByText(/^Printing ·/)).toBeVisible({ timeout: 15_000 });
  await operator.getByRole("button", { name: "Mark failed" }).click();
  await operator.getByLabel("What went wrong").fill("Spaghetti after layer 12");
  await operator.getByRole("button", { name: "Confirm: mark failed" }).click();
  await expect(operator.getByText(/Failed: Spaghetti after layer 12/)).toBeVisible({ timeout: 15_000 });
  await member.reload();
  await expect(member.getByRole("table", { name: "Copies in the workshop" }).getByText("reprint 1").first()).toBeVisible({ timeout: 15_000 });
});
