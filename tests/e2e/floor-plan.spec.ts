// The Floor's plan end to end, by clicking: re-plan, a plate that needs a spool change says so in
// words, Start walks through the change (pick the spool, then start), Move lists only printers that
// can take a plate and moves it, and the member sees when the assembly's parts will all be printed.
import { expect, test, type APIRequestContext } from "@playwright/test";
import { authFile } from "./helpers";

type Change = { from: { material: string; colour: string } | null; to: { material: string; colour: string } } | null;
type WirePlate = { id: number; status: string; version: number; printerId: number; material: string; colour: string; change: Change; startChange: Change; moveTo: { id: number; name: string }[] };
type Board = { lanes: { id: number; name: string; plates: WirePlate[] }[]; spools: { id: number; type: string; colour: string; grams: number }[] };

const board = async (api: APIRequestContext) => (await (await api.get("/api/queue/board")).json()) as Board;
const words = (c: NonNullable<Change>) => {
  const name = (s: { material: string; colour: string }) => `${s.material.toUpperCase()}${s.colour === "any" ? "" : ` ${s.colour}`}`;
  return c.from ? `Load ${name(c.to)}; take ${name(c.from)} off first` : `Load ${name(c.to)}`;
};

test("re-plan, start a plate through its spool change, move a plate, see when the assembly's parts are printed", async ({ browser }) => {
  test.setTimeout(180_000);
  const opCtx = await browser.newContext({ storageState: authFile("operator") });
  const op = await opCtx.newPage();
  await op.goto("/floor");
  await op.getByRole("button", { name: "Re-plan" }).click();
  await expect(op.getByText(/Planned \d+ copies on \d+ plates/)).toBeVisible({ timeout: 30_000 });
  // The status line agrees with the list: it counts the plates listed and never says there is no plan.
  await expect(op.getByTestId("plan-status")).toContainText(/\d+ printing, \d+ planned · last re-plan/);

  // The timeline, at both zooms: day labels are there and no two labels overlap (the now-label included).
  const timeline = op.getByRole("img", { name: /^Timeline of \d+ printers/ });
  for (const zoom of ["Day", "Week"]) {
    await op.getByRole("button", { name: zoom, exact: true }).click();
    await expect(op.getByRole("button", { name: zoom, exact: true })).toHaveAttribute("aria-pressed", "true");
    const boxes = await timeline.evaluate((svg) => [...svg.querySelectorAll("text")].filter((t) => t.textContent).map((t) => ({ text: t.textContent!, ...t.getBoundingClientRect().toJSON() as DOMRect })));
    expect(boxes.some((bx) => /^(Mon|Tue|Wed|Thu|Fri|Sat|Sun) \d{1,2} \w{3}$/.test(bx.text)), `${zoom}: a day label`).toBe(true);
    expect(boxes.some((bx) => bx.text.startsWith("now "))).toBe(true);
    for (let i = 0; i < boxes.length; i++) {
      for (let j = i + 1; j < boxes.length; j++) {
        const a = boxes[i]!;
        const c = boxes[j]!;
        const overlap = a.left < c.right - 0.5 && c.left < a.right - 0.5 && a.top < c.bottom - 0.5 && c.top < a.bottom - 0.5;
        expect(overlap, `${zoom}: "${a.text}" overlaps "${c.text}"`).toBe(false);
      }
    }
    await timeline.screenshot({ path: `test-results/timeline-${zoom.toLowerCase()}.png` });
  }

  // A planned plate whose printer is free and needs another spool now.
  let b = await board(opCtx.request);
  const busy = new Set(b.lanes.filter((l) => l.plates.some((p) => p.status === "printing")).map((l) => l.id));
  const candidates = b.lanes.flatMap((l) => l.plates).filter((p) => p.status === "planned" && p.startChange && p.change);
  let target = candidates.find((p) => !busy.has(p.printerId));
  if (!target) {
    // Every such printer is printing: finish that plate through the API (the start is what is clicked here).
    target = candidates[0]!;
    const running = b.lanes.find((l) => l.id === target!.printerId)!.plates.find((p) => p.status === "printing")!;
    const done = await opCtx.request.post(`/api/plates/${running.id}/finish`, { data: { version: running.version, actualMinutes: 30, shelfLabel: "Shelf Z1" } });
    expect(done.ok()).toBe(true);
    await op.reload();
    b = await board(opCtx.request);
    target = b.lanes.flatMap((l) => l.plates).find((p) => p.id === target!.id)!;
  }
  expect(target, "the demo's re-plan has a plate that needs a spool change").toBeTruthy();
  const item = op.getByTestId(`plate-${target.id}`);
  await expect(item.getByTestId(`spool-${target.id}`)).toContainText(words(target.change!));

  await item.getByRole("button", { name: "Start" }).click();
  const form = op.getByRole("form", { name: `Start plate ${target.id}` });
  await expect(form.getByText(/Spool change first:/)).toBeVisible();
  const picker = form.getByLabel("Spool to load");
  const picked = await picker.inputValue();
  expect(Number(picked)).toBeGreaterThan(0);
  await form.getByRole("button", { name: "Confirm: load the spool and start" }).click();
  await expect(item.getByText(/^Printing on /)).toBeVisible({ timeout: 15_000 });
  b = await board(opCtx.request);
  const lane = b.lanes.find((l) => l.id === target!.printerId)!;
  expect(lane.plates.find((p) => p.id === target!.id)!.status).toBe("printing");
  const mats = (await (await opCtx.request.get("/api/materials")).json()) as { spools: { id: number; loadedPrinterId: number | null }[] }[];
  expect(mats.flatMap((m) => m.spools).find((s) => s.id === Number(picked))!.loadedPrinterId).toBe(target.printerId);

  // Move: the list holds exactly the printers the server says can take the plate; the move lands.
  const movable = b.lanes.flatMap((l) => l.plates).find((p) => p.status === "planned" && p.moveTo.length > 0);
  expect(movable, "some planned plate can go to another printer").toBeTruthy();
  const mItem = op.getByTestId(`plate-${movable!.id}`);
  await mItem.getByRole("button", { name: "Move" }).click();
  const mForm = op.getByRole("form", { name: `Move plate ${movable!.id}` });
  const options = await mForm.getByLabel("Move to printer").locator("option").allTextContents();
  expect(options).toEqual(movable!.moveTo.map((p) => p.name));
  const dest = movable!.moveTo[movable!.moveTo.length - 1]!;
  await mForm.getByLabel("Move to printer").selectOption(String(dest.id));
  await mForm.getByRole("button", { name: "Confirm: move" }).click();
  await expect(mItem.getByText(new RegExp(`^Planned on ${dest.name}$`))).toBeVisible({ timeout: 15_000 });
  const after = (await (await opCtx.request.get(`/api/plates/${movable!.id}`)).json()) as { plate: { printerId: number } };
  expect(after.plate.printerId).toBe(dest.id);

  // The member's sub-assembly whose unprinted copies are all on plates now: "All parts printed by …".
  const member = await browser.newPage({ storageState: authFile("member") });
  await member.goto("/bench");
  await member.getByRole("link", { name: "Camera slider" }).first().click();
  await member.getByRole("link", { name: "Carriage" }).first().click();
  await expect(member.getByText(/^All parts printed by \w{3} \d{1,2} \w{3}, \d{2}:\d{2}$/)).toBeVisible({ timeout: 15_000 });
  await member.goto("/bench");
  await member.getByRole("link", { name: "Camera slider" }).first().click();
  await expect(member.getByText(/not planned yet/).first()).toBeVisible();
  await opCtx.close();
});
