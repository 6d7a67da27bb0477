// Concurrency: many parallel changes of one part, one copy and one queue entry, each carrying the
// version it read, end with exactly one winner per version, the rest 409, and a final state equal to
// the winner's request (no mix of two). Two re-plans at once never put a copy on two plates.
// Optimistic concurrency with a version column: common practice, no source; 409 per RFC 9110 §15.5.10.
import { expect, test, type APIRequestContext } from "@playwright/test";
import type mysql from "mysql2/promise";
import { apiClients, disposeAll, e2eDb, loadFixtures, rows, throwawayPart, type Caller, type Fixtures } from "./security-fixtures";

let api: Record<Caller, APIRequestContext>;
let conn: mysql.Connection;
let fx: Fixtures;
/** Races run on a part of Jun's own making (three drafted copies), so the seeded parts stay as they are. */
let partId: number;
const N = 50;

test.beforeAll(async () => {
  api = await apiClients();
  conn = await e2eDb();
  fx = await loadFixtures(api.owner, conn);
  partId = await throwawayPart(api.owner, "Race rig", 3);
});

test.afterAll(async () => {
  await disposeAll(api);
  await conn.end();
});

function tally(statuses: number[]) {
  const by = new Map<number, number>();
  for (const s of statuses) by.set(s, (by.get(s) ?? 0) + 1);
  return Object.fromEntries(by);
}

test(`${N} parallel edits of one part: one wins, ${N - 1} get 409, the stored part is the winner's whole request`, async () => {
  const read = (await (await api.owner.get(`/api/parts/${partId}`)).json()) as { part: { version: number } };
  const v = read.part.version;
  const sends = Array.from({ length: N }, (_, k) =>
    api.owner.patch(`/api/parts/${partId}`, { data: { version: v, notes: `race note ${k}`, colour: `race-${k}` } }).then(async (r) => ({ k, status: r.status(), body: await r.text() })),
  );
  const results = await Promise.all(sends);
  const wins = results.filter((r) => r.status === 200);
  expect(tally(results.map((r) => r.status))).toEqual({ 200: 1, 409: N - 1 });
  const [row] = await rows<{ notes: string; colour: string; version: number }>(conn, "SELECT notes, colour, version FROM parts WHERE id = ?", [partId]);
  const k = wins[0]!.k;
  // Both fields come from the same request.
  expect(row).toEqual({ notes: `race note ${k}`, colour: `race-${k}`, version: v + 1 });
  for (const r of results.filter((x) => x.status === 409)) expect((JSON.parse(r.body) as { error: string }).error).toMatch(/changed this part/);
});

test(`${N} parallel edits in rounds, each re-reading the version: versions go up by exactly the number of wins`, async () => {
  const start = ((await (await api.owner.get(`/api/parts/${partId}`)).json()) as { part: { version: number } }).part.version;
  let wins = 0;
  // Five rounds of ten: each round reads the version once, so each round has exactly one winner.
  for (let round = 0; round < 5; round++) {
    const v = ((await (await api.owner.get(`/api/parts/${partId}`)).json()) as { part: { version: number } }).part.version;
    const st = await Promise.all(Array.from({ length: 10 }, (_, k) => api.owner.patch(`/api/parts/${partId}`, { data: { version: v, notes: `round ${round} ${k}` } }).then((r) => r.status())));
    expect(tally(st)).toEqual({ 200: 1, 409: 9 });
    wins += 1;
  }
  const end = ((await (await api.owner.get(`/api/parts/${partId}`)).json()) as { part: { version: number } }).part.version;
  expect(end - start).toBe(wins);
});

test(`${N} parallel status changes of one copy: one moves it, one event is recorded`, async () => {
  // A copy the owner may move on now (its allowed targets come with the part).
  const det = { parts: [{ id: partId }] };
  let target: { partId: number; instanceId: number; version: number; to: string } | undefined;
  for (const p of det.parts) {
    const d = (await (await api.owner.get(`/api/parts/${p.id}`)).json()) as { instances: { id: number; version: number; next: string[] }[] };
    const i = d.instances.find((x) => x.next.length > 0);
    if (i) {
      target = { partId: p.id, instanceId: i.id, version: i.version, to: i.next[0]! };
      break;
    }
  }
  expect(target, "a copy Jun may move").toBeDefined();
  const t = target!;
  const events = async () => Number((await rows<{ n: number }>(conn, "SELECT COUNT(*) n FROM part_status_events WHERE instance_id = ?", [t.instanceId]))[0]?.n);
  const before = await events();
  const st = await Promise.all(
    Array.from({ length: N }, () => api.owner.post(`/api/parts/${t.partId}/status`, { data: { instanceId: t.instanceId, to: t.to, version: t.version, reason: "concurrency check" } }).then((r) => r.status())),
  );
  expect(tally(st)).toEqual({ 200: 1, 409: N - 1 });
  const [row] = await rows<{ status: string; version: number }>(conn, "SELECT status, version FROM part_instances WHERE id = ?", [t.instanceId]);
  expect(row).toEqual({ status: t.to, version: t.version + 1 });
  expect(await events()).toBe(before + 1);
});

test(`${N} parallel priority changes of one queue entry by two operators' roles: one wins`, async () => {
  const [q] = await rows<{ version: number; priority: number }>(conn, "SELECT version, priority FROM queue_entries WHERE id = ?", [fx.queueEntryId]);
  const v = q!.version;
  const st = await Promise.all(
    Array.from({ length: N }, (_, k) => (k % 2 ? api.operator : api.admin).patch(`/api/queue/${fx.queueEntryId}`, { data: { version: v, priority: (k % 3) + 1 } }).then((r) => r.status())),
  );
  expect(tally(st)).toEqual({ 200: 1, 409: N - 1 });
  const [after] = await rows<{ version: number }>(conn, "SELECT version FROM queue_entries WHERE id = ?", [fx.queueEntryId]);
  expect(after!.version).toBe(v + 1);
  // Put the seeded entry's priority back for the specs after this one.
  expect((await api.admin.patch(`/api/queue/${fx.queueEntryId}`, { data: { version: v + 1, priority: q!.priority } })).status()).toBe(200);
});

test("two re-plans at once (operator and admin) never put a copy on two plates", async () => {
  test.setTimeout(120_000);
  for (let round = 0; round < 3; round++) {
    const [a, b] = await Promise.all([api.operator.post("/api/plan"), api.admin.post("/api/plan")]);
    // Serialised on the server: both finish (one after the other), or the second is told to wait.
    for (const r of [a, b]) expect([200, 409], await r.text()).toContain(r.status());
    expect([a.status(), b.status()]).toContain(200);
    // Judged from plate status, not from the active_instance_id column the unique index guards.
    const doubles = await rows<{ instance_id: number; n: number }>(
      conn,
      "SELECT pi.instance_id, COUNT(*) n FROM plate_items pi JOIN plates p ON p.id = pi.plate_id WHERE p.status IN ('planned','printing') GROUP BY pi.instance_id HAVING n > 1",
    );
    expect(doubles).toEqual([]);
    // And every copy on a live plate is in a plated or printing state.
    const wrong = await rows<{ id: number; status: string }>(
      conn,
      "SELECT i.id, i.status FROM plate_items pi JOIN plates p ON p.id = pi.plate_id JOIN part_instances i ON i.id = pi.instance_id WHERE p.status IN ('planned','printing') AND i.status NOT IN ('plated','printing')",
    );
    expect(wrong).toEqual([]);
  }
});
