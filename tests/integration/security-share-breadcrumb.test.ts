// Finding 11 (issue 17): a read share on a sub-assembly showed the parent's name in the breadcrumb.
// The trail now starts at the highest node the viewer was given; owner and workshop see it all.
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { users, workshopSettings } from "@/db/schema";
import { createAssembly, shareAssembly } from "@/lib/server/assemblies";
import { createPart, getAssemblyDetail, getPartDetail } from "@/lib/server/parts";
import type { SessionUser } from "@/lib/server/session";

async function person(email: string, role: SessionUser["role"]): Promise<SessionUser> {
  await db().insert(users).ignore().values({ email, name: email.split("@")[0]!, role, passwordHash: "x" });
  const [u] = await db().select({ id: users.id, email: users.email, name: users.name, role: users.role }).from(users).where(eq(users.email, email));
  return u!;
}

let owner: SessionUser, reader: SessionUser, operator: SessionUser;
let root = 0, mid = 0, leaf = 0, partId = 0;

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Test shop" });
  owner = await person("crumb-owner@test.example", "member");
  reader = await person("crumb-reader@test.example", "member");
  operator = await person("crumb-op@test.example", "operator");
  root = (await createAssembly(owner, { name: "Secret rover project", description: "" })).id;
  mid = (await createAssembly(owner, { name: "Drive train", description: "", parentId: root })).id;
  leaf = (await createAssembly(owner, { name: "Left wheel", description: "", parentId: mid })).id;
  partId = (await createPart(owner, leaf, { name: "Hub", quantity: 1, material: "PLA", colour: "", notes: "" })).id;
  await shareAssembly(owner, mid, { email: reader.email, access: "read" });
});
afterAll(closeDb);

describe("the breadcrumb of a shared sub-assembly", () => {
  it("starts at the shared node for the member it was shared with", async () => {
    expect((await getAssemblyDetail(reader, leaf)).trail.map((t) => t.name)).toEqual(["Drive train", "Left wheel"]);
    expect((await getAssemblyDetail(reader, mid)).trail.map((t) => t.name)).toEqual(["Drive train"]);
    const part = await getPartDetail(reader, partId);
    expect(part.trail.map((t) => t.name)).toEqual(["Drive train", "Left wheel"]);
    expect(JSON.stringify(part.trail)).not.toContain("Secret rover project");
  });

  it("is whole for the owner and the workshop", async () => {
    expect((await getAssemblyDetail(owner, leaf)).trail.map((t) => t.name)).toEqual(["Secret rover project", "Drive train", "Left wheel"]);
    expect((await getAssemblyDetail(operator, leaf)).trail.map((t) => t.name)).toEqual(["Secret rover project", "Drive train", "Left wheel"]);
  });
});
