// Assemblies, sharing, parts and status changes against the real database, through the DAL.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { partInstances, statusEvents, users, workshopSettings } from "@/db/schema";
import { accessTo, createAssembly, createItem, shareAssembly, updateAssembly } from "@/lib/server/assemblies";
import { AppError } from "@/lib/server/errors";
import { bomCsv, changeStatus, createPart, getAssemblyDetail, getPartDetail, updatePart } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";

async function person(email: string, role: SessionUser["role"]): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role, passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

async function code(p: Promise<unknown>): Promise<string> {
  try {
    await p;
    return "ok";
  } catch (e) {
    if (e instanceof AppError) return e.code;
    throw e;
  }
}

let owner: SessionUser, other: SessionUser, operator: SessionUser;

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop", defaultLayerHeightMm: 0.16, defaultWalls: 4, defaultInfillPercent: 25 });
  owner = await person("owner-a@test.example", "member");
  other = await person("other-a@test.example", "member");
  operator = await person("op-a@test.example", "operator");
});
afterAll(() => closeDb());

describe("assemblies and sharing", () => {
  it("hides an assembly from other members until it is shared, and sharing covers the subtree", async () => {
    const { id: root } = await createAssembly(owner, { name: "Cable winch", description: "", targetDate: "2026-10-01" });
    const { id: sub } = await createAssembly(owner, { name: "Gearbox", description: "", parentId: root });
    const { id: subsub } = await createAssembly(owner, { name: "Output stage", description: "", parentId: sub });
    expect(await code(accessTo(other, subsub))).toBe("not_found");
    expect(await code(getAssemblyDetail(other, root))).toBe("not_found");
    // The workshop reads everything but changes nothing.
    expect((await accessTo(operator, subsub)).access).toBe("workshop");
    expect(await code(createPart(operator, sub, { name: "x", quantity: 1, material: "PLA", colour: "", notes: "" }))).toBe("forbidden");

    await shareAssembly(owner, sub, { email: other.email, access: "read" });
    expect((await accessTo(other, subsub)).access).toBe("read");
    expect(await code(accessTo(other, root))).toBe("not_found"); // the share is below the root
    expect(await code(updateAssembly(other, sub, { name: "Mine now", version: 1 }))).toBe("forbidden");
    expect(await code(shareAssembly(other, sub, { email: owner.email, access: "edit" }))).toBe("forbidden");

    await shareAssembly(owner, sub, { email: other.email, access: "edit" });
    const { id: part } = await createPart(other, subsub, { name: "Output shaft", quantity: 1, material: "PETG", colour: "", notes: "" });
    expect((await getPartDetail(owner, part)).part.name).toBe("Output shaft");
    // An edit share still does not pass sharing on.
    expect(await code(shareAssembly(other, sub, { email: operator.email, access: "read" }))).toBe("forbidden");
  });

  it("makes one instance per copy, with the workshop's default settings, and progress counts copies", async () => {
    const { id: a } = await createAssembly(owner, { name: "Desk lamp", description: "" });
    const { id: part } = await createPart(owner, a, { name: "Arm link", quantity: 4, material: "PLA", colour: "grey", notes: "" });
    const det = await getPartDetail(owner, part);
    expect(det.instances.map((i) => i.copyNo)).toEqual([1, 2, 3, 4]);
    expect(det.part).toMatchObject({ layerHeightMm: 0.16, walls: 4, infillPercent: 25 });
    expect(det.instances.every((i) => i.status === "drafted")).toBe(true);
    await updatePart(owner, part, { quantity: 2, version: det.part.version });
    expect((await getPartDetail(owner, part)).instances).toHaveLength(2);
    const tree = await getAssemblyDetail(owner, a);
    expect(tree.nodes[0]).toMatchObject({ needed: 2, done: 0 });
    expect(tree.blockers.notUploaded.map((p) => p.id)).toContain(part);
  });
});

describe("status changes", () => {
  it("refuses a change by a member who does not own the part, and records who, when and why", async () => {
    const { id: a } = await createAssembly(owner, { name: "Plant stand", description: "" });
    const { id: part } = await createPart(owner, a, { name: "Leg", quantity: 1, material: "PLA", colour: "", notes: "" });
    const [inst] = (await getPartDetail(owner, part)).instances;
    const i = inst!;
    // Not shared at all: the part does not exist for them.
    expect(await code(changeStatus(other, part, { instanceId: i.id, to: "ready", reason: "", version: i.version }))).toBe("not_found");
    await shareAssembly(owner, a, { email: other.email, access: "read" });
    expect(await code(changeStatus(other, part, { instanceId: i.id, to: "ready", reason: "", version: i.version }))).toBe("forbidden");
    const [still] = await db().select({ status: partInstances.status }).from(partInstances).where(eq(partInstances.id, i.id));
    expect(still?.status).toBe("drafted");

    let v = i.version;
    const step = async (u: SessionUser, to: Parameters<typeof changeStatus>[2]["to"], reason = "") => {
      const r = await changeStatus(u, part, { instanceId: i.id, to, reason, version: v });
      v = r.version;
      return r;
    };
    await step(owner, "ready");
    await step(owner, "queued");
    expect(await code(step(owner, "plated"))).toBe("invalid"); // the workshop plates, not the member
    await step(operator, "plated");
    await step(operator, "printing");
    expect(await code(step(operator, "failed"))).toBe("invalid"); // a failure needs a reason
    const failed = await step(operator, "failed", "Warped off the bed");
    expect(failed).toMatchObject({ status: "queued", reprints: 1 });
    // A stale version is refused rather than applied twice.
    expect(await code(changeStatus(operator, part, { instanceId: i.id, to: "plated", reason: "", version: i.version }))).toBe("conflict");

    const events = await db().select({ from: statusEvents.fromStatus, to: statusEvents.toStatus, by: statusEvents.byUserId, reason: statusEvents.reason }).from(statusEvents).where(eq(statusEvents.instanceId, i.id)).orderBy(statusEvents.id);
    expect(events.map((e) => `${e.from ?? "-"}>${e.to}`)).toEqual(["->drafted", "drafted>ready", "ready>queued", "queued>plated", "plated>printing", "printing>failed", "failed>queued"]);
    expect(events[5]).toMatchObject({ by: operator.id, reason: "Warped off the bed" });
    const tree = await getAssemblyDetail(owner, a);
    expect(tree.blockers.failed).toEqual([{ id: part, name: "Leg", count: 1 }]);
  });
});

describe("bill of materials", () => {
  it("exports parts and items as RFC 4180 CSV", async () => {
    const { id: a } = await createAssembly(owner, { name: "Bike rack, wall", description: "" });
    await createPart(owner, a, { name: 'Hook "large"', quantity: 2, material: "PETG", colour: "black", notes: "" });
    await createItem(owner, a, { kind: "hardware", name: "M5x20 screw, DIN 912", quantity: 8, source: "=HYPERLINK()", unitPriceCents: 12, status: "ordered", notes: "" });
    const { filename, csv } = await bomCsv(owner, a);
    expect(filename).toBe("bike-rack-wall-bom.csv");
    const lines = csv.split("\r\n"); // RFC 4180 §2.1: records end with CRLF
    expect(lines.at(-1)).toBe("");
    expect(lines).toContain('printed part,"Hook ""large""","Bike rack, wall",2,PETG,black,2 drafted,,,'); // §2.5–2.7: quotes doubled inside quoted fields; no mesh, so no size
    // A formula-looking cell is defused (common practice: OWASP "CSV injection").
    expect(lines).toContain(`bought hardware,"M5x20 screw, DIN 912","Bike rack, wall",8,'=HYPERLINK(),,ordered,12,,`);
  });
});
