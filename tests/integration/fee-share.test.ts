import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db";
import { assemblies, partInstances, parts, plateItems, plates, printers } from "@/db/schema";
import { feeShare } from "@/lib/server/quotes";
import { user } from "./helpers";

afterAll(closeDb);

// The Ledger splits a plate's fee evenly between the members on it (memberCharges); the quote
// carries the fee divided by the members a plate has had on average (worked by hand below).
describe("the plate fee as it is really shared", () => {
  it("is the whole fee before any plate is finished, then the fee over the mean members a plate", async () => {
    expect(await feeShare(300)).toEqual({ plateFeeCents: 300, membersPerPlate: 1, platesSeen: 0, shareCents: 300 });
    const members = await Promise.all([1, 2, 3].map((k) => user(`fee${k}@example.test`, "member")));
    const [pr] = await db().insert(printers).values({ name: "Fee test printer", bedXMm: 200, bedYMm: 200, heightMm: 150, nozzleMm: 0.4, hourlyRateCents: 100, startupMinutes: 5 }).$returningId();
    const copyOf = async (ownerId: number) => {
      const [a] = await db().insert(assemblies).values({ ownerId, name: `fee assembly ${ownerId}` }).$returningId();
      const [p] = await db().insert(parts).values({ assemblyId: a!.id, name: "fee part", quantity: 1, material: "PLA", colour: "white", layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
      const [i] = await db().insert(partInstances).values({ partId: p!.id, copyNo: 1, status: "printed" }).$returningId();
      return i!.id;
    };
    const finished = async (owners: number[], endedAt: Date) => {
      const now = new Date();
      const [pl] = await db().insert(plates).values({ printerId: pr!.id, status: "finished", material: "pla", colour: "white", plannedStart: now, plannedEnd: now, endedAt, estimatedMinutes: 60, estimatedGrams: 10, quote: {}, quotedAt: now }).$returningId();
      for (const o of owners) await db().insert(plateItems).values({ plateId: pl!.id, instanceId: await copyOf(o), memberId: o, x: 5, y: 5, sizeX: 10, sizeY: 10, sizeZ: 10, minutes: 30, grams: 5 });
    };
    // One plate with one member (two of their copies), one with three members: (1 + 3) / 2 = 2 a plate.
    await finished([members[0]!.id, members[0]!.id], new Date(Date.now() - 7_200_000));
    await finished(members.map((m) => m.id), new Date(Date.now() - 3_600_000));
    expect(await feeShare(300)).toEqual({ plateFeeCents: 300, membersPerPlate: 2, platesSeen: 2, shareCents: 150 });
  });
});
