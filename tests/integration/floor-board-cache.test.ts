// The Floor board's shared read cache on the real database: a write made by this process is seen by
// the very next board read, whether it was a single statement or a transaction (not before its
// COMMIT, at once after it), also while many reads run at the same time; writes to tables the board
// does not show leave the cache alone. Expected values are the rows the test itself wrote (common
// practice, no source).
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db, pool } from "@/db";
import { changeGeneration, changesWatchedData } from "@/db/change-watch";
import { outsideTransaction } from "@/db/tx-guard";
import { assemblies, attendedHours, mailOutbox, partInstances, parts, printers, queueEntries, workshopSettings } from "@/db/schema";
import { floorBoard } from "@/lib/server/floor-board";
import { cachedOpenIntervals, setAttendedHours } from "@/lib/server/hours";
import { setPriority } from "@/lib/server/queue";
import type { SessionUser } from "@/lib/server/session";
import { attendedHoursInput } from "@/lib/validation/hours";
import { user } from "./helpers";

let operator: SessionUser, admin: SessionUser, member: SessionUser;
let printerId = 0;
let entryId = 0;

beforeAll(async () => {
  await db().insert(workshopSettings).ignore().values({ id: 1, name: "Board cache shop", timezone: "Europe/Berlin", currency: "EUR" });
  await db().delete(attendedHours);
  await db().insert(attendedHours).values([1, 2, 3, 4, 5].map((weekday) => ({ weekday, opensAt: "09:00", closesAt: "17:00" })));
  operator = await user("board-op@test.example", "operator");
  admin = await user("board-admin@test.example", "admin");
  member = await user("board-m@test.example", "member");
  const [pr] = await db().insert(printers).values({ name: "Cache Wren", bedXMm: 200, bedYMm: 200, heightMm: 150, nozzleMm: 0.4, hourlyRateCents: 300, startupMinutes: 6 }).$returningId();
  printerId = pr!.id;
  const [a] = await db().insert(assemblies).values({ ownerId: member.id, name: "Cache assembly" }).$returningId();
  const [p] = await db().insert(parts).values({ assemblyId: a!.id, name: "Cache bracket", quantity: 1, material: "PLA", colour: "white", layerHeightMm: 0.2, walls: 2, infillPercent: 15 }).$returningId();
  const [i] = await db().insert(partInstances).values({ partId: p!.id, copyNo: 1, status: "queued" }).$returningId();
  const [e] = await db().insert(queueEntries).values({ instanceId: i!.id, memberId: member.id, sentBy: member.id, priority: 0 }).$returningId();
  entryId = e!.id;
});

afterAll(async () => {
  await closeDb();
});

const laneName = async () => (await floorBoard(operator)).lanes.find((l) => l.id === printerId)?.name;

describe("which statements count as changes", () => {
  it("writes to board tables count, reads and quiet tables do not", () => {
    expect(changesWatchedData("update `printers` set `name` = ? where `printers`.`id` = ?")).toBe(true);
    expect(changesWatchedData("insert ignore into `queue_entries` (`id`) values (default)")).toBe(true);
    expect(changesWatchedData("delete from `assemblies` where `id` = ?")).toBe(true); // cascades into parts
    expect(changesWatchedData("  /* note */ DELETE FROM plates WHERE id = 1")).toBe(true);
    expect(changesWatchedData("select * from `printers` for update")).toBe(false);
    expect(changesWatchedData("insert into `mail_outbox` (`kind`) values (?)")).toBe(false);
    expect(changesWatchedData("UPDATE mail_outbox SET claim_token = ? ORDER BY id LIMIT 5")).toBe(false);
    // A quiet target that names a board table, and anything not understood, count.
    expect(changesWatchedData("insert into `part_status_events` select * from `part_instances`")).toBe(true);
    expect(changesWatchedData("REPLACE mystery_table VALUES (1)")).toBe(true);
  });
});

describe("the shared board", () => {
  it("is shared between reads while nothing changes", async () => {
    const a = await floorBoard(operator);
    const b = await floorBoard(admin);
    expect(b.waiting).toBe(a.waiting); // the same frozen rows, read once
    expect(Object.isFrozen(a.waiting)).toBe(true);
  });

  it("shows a single-statement write on the next read", async () => {
    expect(await laneName()).toBe("Cache Wren");
    await db().update(printers).set({ name: "Cache Wren II" }).where(eq(printers.id, printerId));
    expect(await laneName()).toBe("Cache Wren II");
  });

  it("shows a data-layer write (priority) on the next read", async () => {
    const before = (await floorBoard(operator)).waiting.find((w) => w.entryId === entryId)!;
    await setPriority(operator, entryId, { priority: 2, version: before.version });
    const after = (await floorBoard(operator)).waiting.find((w) => w.entryId === entryId)!;
    expect(after.priority).toBe(2);
    expect(after.version).toBe(before.version + 1);
  });

  it("shows a transaction's write only after COMMIT, and at once after it", async () => {
    await db().transaction(async (tx) => {
      await tx.update(printers).set({ name: "Cache Wren III" }).where(eq(printers.id, printerId));
      // Another connection (another request: outside this transaction) does not see the uncommitted
      // name; this read fills the cache with the old one.
      expect(await outsideTransaction(laneName)).toBe("Cache Wren II");
      expect(await outsideTransaction(laneName)).toBe("Cache Wren II");
    });
    expect(await laneName()).toBe("Cache Wren III");
  });

  it("forgets nothing after a rolled-back transaction", async () => {
    await db()
      .transaction(async (tx) => {
        await tx.update(printers).set({ name: "Never saved" }).where(eq(printers.id, printerId));
        throw new Error("roll back");
      })
      .catch(() => undefined);
    expect(await laneName()).toBe("Cache Wren III");
  });

  it("is not emptied by writes to tables the board does not show", async () => {
    await floorBoard(operator);
    const g = changeGeneration();
    await db().insert(mailOutbox).values({ kind: "invitation", toAddress: "x@test.example", subject: "s", textBody: "t", htmlBody: "<p>t</p>" });
    expect(changeGeneration()).toBe(g);
  });

  it("never serves a name older than the last completed write, with 40 reads running alongside", async () => {
    let stop = false;
    const readers = Array.from({ length: 40 }, async () => {
      while (!stop) {
        await floorBoard(operator);
        // A cached answer resolves without I/O: yield, as requests arriving over the network do.
        await new Promise((r) => setImmediate(r));
      }
    });
    try {
      for (let i = 0; i < 15; i++) {
        const name = `Cache Wren run ${i}`;
        if (i % 2) {
          await db().update(printers).set({ name }).where(eq(printers.id, printerId));
        } else {
          await db().transaction(async (tx) => {
            await tx.update(printers).set({ name }).where(eq(printers.id, printerId));
            await outsideTransaction(() => floorBoard(operator)); // another request's read inside the writer's window
          });
        }
        expect(await laneName()).toBe(name);
      }
    } finally {
      stop = true;
      await Promise.all(readers);
    }
  });

  it("drops the attended calendar when the hours change", async () => {
    const from = new Date("2027-03-01T00:00:00Z"); // a Monday
    const to = new Date("2027-03-02T00:00:00Z");
    const before = await cachedOpenIntervals(from, to);
    // 09:00–17:00 in Berlin is 08:00–16:00 UTC in winter (CET = UTC+1, from the IANA tz database).
    expect(before.open).toEqual([{ start: Date.parse("2027-03-01T08:00:00Z"), end: Date.parse("2027-03-01T16:00:00Z") }]);
    await setAttendedHours(admin, attendedHoursInput.parse({ windows: [{ weekday: 1, open: "10:00", close: "12:00" }] }));
    const after = await cachedOpenIntervals(from, to);
    expect(after.open).toEqual([{ start: Date.parse("2027-03-01T09:00:00Z"), end: Date.parse("2027-03-01T11:00:00Z") }]);
  });

  it("keeps the role check", async () => {
    await expect(floorBoard(member)).rejects.toMatchObject({ code: "forbidden" });
  });

  it("uses the pool the app writes through", () => {
    expect((pool() as unknown as { __pwWatched?: boolean }).__pwWatched).toBe(true);
  });
});
