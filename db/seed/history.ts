// Four months of invented past work for the Kettle Lane Workshop, so the Insights page has something
// real on first start: finished and failed plates on every demo printer, maintenance spells, the
// copies on them with their queue times, print history, charges and monthly payments.
// Deterministic (a seeded PRNG; times counted back from today's local midnight) and idempotent: it
// runs only when the archive members have no archive assembly yet. Everything ends before today,
// and the work belongs to a dedicated set of archive members, so live plates and the Bench
// members' own projects are untouched.
import bcrypt from "bcryptjs";
import { randomBytes } from "node:crypto";
import { asc, eq, inArray } from "drizzle-orm";
import type { MySql2Database } from "drizzle-orm/mysql2";
import { createAttendedCalendar } from "../../lib/calendar/attended-hours";
import { quoteCost } from "../../lib/estimate";
import { addDays, localDateOf, localMidnight } from "../../lib/insights/period";
import * as schema from "../schema";

type D = MySql2Database<typeof schema>;
const { assemblies, attendedHours, charges, materials, partInstances, parts, payments, plateItems, plates, printerMaintenance, printerMaterials, printers, printHistory, queueEntries, users, workshopSettings } = schema;

const DAYS = 120;
const ARCHIVE = "Workshop archive";
const MIN = 60_000;
const HOUR = 3_600_000;

// Invented archive members (their accounts cannot be signed into: the password is random).
const archiveMembers = [
  { email: "odile@kettlelane.example", name: "Odile Marchetti", weight: 5 },
  { email: "kwame@kettlelane.example", name: "Kwame Asante", weight: 4 },
  { email: "lena@kettlelane.example", name: "Lena Vogt", weight: 3 },
  { email: "ravi@kettlelane.example", name: "Ravi Menon", weight: 2 },
  { email: "sade@kettlelane.example", name: "Sade Okafor", weight: 1 },
];
// Printer character for the invented history: speed against the estimate and how often it fails.
const character: Record<string, { factor: number; failRate: number }> = {
  Wren: { factor: 1.04, failRate: 0.12 },
  Heron: { factor: 1.09, failRate: 0.06 },
  Kestrel: { factor: 0.97, failRate: 0.08 },
  Osprey: { factor: 1.01, failRate: 0.04 },
};
const colours: Record<string, string[]> = { pla: ["White", "Black", "Orange"], petg: ["Blue", "Black"], abs: ["Grey"], asa: ["Black"], tpu: ["Clear"], nylon: ["Natural"], pc: ["Clear"] };
const materialOdds: Record<string, number> = { pla: 10, petg: 5, abs: 1.5, asa: 1, tpu: 0.6, nylon: 0.4, pc: 0.3 };
const reasons = ["Corner lifted off the bed", "Nozzle clog mid-print", "Layer shift near the top", "Spool ran out", "Support came loose", "First layer did not stick"];
const partNames = ["Bracket", "Cable clip", "Knob", "Hinge leaf", "Spacer", "Cover"];

/** mulberry32: a small, well-known 32-bit PRNG; one fixed seed gives the same history every time. */
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function batched<T>(list: T[], size: number, fn: (chunk: T[]) => Promise<unknown>) {
  for (let i = 0; i < list.length; i += size) await fn(list.slice(i, i + size));
}

interface Item { member: number; instance: number; grams: number; minutes: number }
interface Plate { printerId: number; status: "finished" | "failed"; material: string; colour: string; start: number; end: number; estMin: number; actMin: number; estG: number; actG: number | null; reason: string | null; unattended: boolean; items: Item[] }

export async function seedHistory(d: D): Promise<{ plates: number }> {
  // Members first (insert-ignore), then the idempotency check on their archive assemblies.
  const hash = await bcrypt.hash(randomBytes(24).toString("hex"), 4);
  await d.insert(users).ignore().values(archiveMembers.map((m) => ({ email: m.email, name: m.name, role: "member" as const, passwordHash: hash })));
  const people = await d.select({ id: users.id, email: users.email }).from(users).where(inArray(users.email, archiveMembers.map((m) => m.email)));
  const memberIds = archiveMembers.map((m) => people.find((p) => p.email === m.email)?.id ?? 0);
  if (memberIds.includes(0)) return { plates: 0 };
  const [done] = await d.select({ id: assemblies.id }).from(assemblies).where(inArray(assemblies.ownerId, memberIds)).limit(1);
  if (done) return { plates: 0 };

  const [ws] = await d.select({ tz: workshopSettings.timezone, currency: workshopSettings.currency, fee: workshopSettings.plateFeeCents }).from(workshopSettings).where(eq(workshopSettings.id, 1));
  const tz = ws?.tz ?? "Europe/Berlin";
  const windows = await d.select({ weekday: attendedHours.weekday, open: attendedHours.opensAt, close: attendedHours.closesAt }).from(attendedHours);
  const cal = createAttendedCalendar(tz, windows.length ? windows : [1, 2, 3, 4, 5].map((weekday) => ({ weekday, open: "09:00", close: "21:00" })));
  const pr = await d.select({ id: printers.id, name: printers.name, rate: printers.hourlyRateCents }).from(printers).orderBy(asc(printers.id));
  const links = await d.select({ printerId: printerMaterials.printerId, type: printerMaterials.materialType }).from(printerMaterials);
  const mats = await d.select({ type: materials.type, price: materials.pricePerKgCents }).from(materials).orderBy(asc(materials.pricePerKgCents));
  const priceOf = (type: string) => mats.find((m) => m.type === type)?.price ?? 2500;

  const rnd = prng(20260101);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)]!;
  const weighted = <T>(xs: readonly T[], w: (x: T) => number) => {
    let r = rnd() * xs.reduce((s, x) => s + w(x), 0);
    for (const x of xs) if ((r -= w(x)) <= 0) return x;
    return xs[xs.length - 1]!;
  };
  const today = localDateOf(Date.now(), tz);
  const horizonEnd = localMidnight(today, tz);
  const horizonStart = localMidnight(addDays(today, -DAYS), tz);

  // Parts are made per member and material when first needed; copies are numbered per part.
  const partKeys: { member: number; type: string; colour: string; name: string }[] = [];
  const copies: { part: number; copyNo: number; sentAt: number; status: "accepted" | "printed" | "failed"; reprints: number }[] = [];
  const copyCount = new Map<number, number>();
  const partIndex = (member: number, type: string, colour: string) => {
    let i = partKeys.findIndex((k) => k.member === member && k.type === type && k.colour === colour);
    if (i < 0) i = partKeys.push({ member, type, colour, name: `${pick(partNames)} (${type.toUpperCase()} ${colour.toLowerCase()})` }) - 1;
    return i;
  };
  const pending = new Map<string, Item[]>(); // failed copies waiting for a reprint on the same printer, by material and colour
  const out: Plate[] = [];
  const maint: { printerId: number; start: number; end: number; note: string }[] = [];

  for (const p of pr) {
    const types = links.filter((l) => l.printerId === p.id).map((l) => l.type);
    if (!types.length) continue;
    const ch = character[p.name] ?? { factor: 1, failRate: 0.07 };
    const spells = Array.from({ length: 1 + Math.floor(rnd() * 2) }, () => {
      const s = localMidnight(addDays(today, -Math.floor(5 + rnd() * (DAYS - 10))), tz) + 9 * HOUR;
      return { printerId: p.id, start: s, end: s + (1 + Math.floor(rnd() * 3)) * 24 * HOUR + Math.floor(rnd() * 6) * HOUR, note: pick(["Hot end replaced", "Belt and idler service", "Bed re-levelled and PEI sheet swapped", "Extruder gears cleaned"]) };
    });
    maint.push(...spells);
    let t = horizonStart + rnd() * 12 * HOUR;
    for (let guard = 0; guard < 5000; guard++) {
      t = cal.nextOpening(t) ?? t; // someone has to be there to start a plate
      const down = spells.find((s) => t >= s.start && t < s.end);
      if (down) {
        t = down.end;
        continue;
      }
      const type = weighted(types, (x) => materialOdds[x] ?? 0.2);
      const colour = pick(colours[type] ?? ["Natural"]);
      const estMin = Math.round(35 + 560 * rnd() * rnd());
      const actMin = Math.round(estMin * ch.factor * (0.93 + 0.14 * rnd()));
      const failed = rnd() < ch.failRate;
      const end = t + (failed ? Math.round(actMin * (0.1 + 0.8 * rnd())) : actMin) * MIN;
      if (end >= horizonEnd) break;
      const clash = spells.find((s) => s.start < end && s.end > t);
      if (clash) {
        t = clash.end;
        continue;
      }
      const estG = Math.round(estMin * (0.22 + 0.2 * rnd()) * 10) / 10;
      // Reprints first, then fresh copies from members chosen by how much they print.
      const key = `${p.id}|${type}|${colour}`;
      const items: Item[] = (pending.get(key) ?? []).splice(0, 2);
      const want = Math.max(items.length, 1 + Math.floor(rnd() * 4));
      while (items.length < want) {
        const m = weighted(archiveMembers.map((_, i) => i), (i) => archiveMembers[i]!.weight);
        const part = partIndex(memberIds[m]!, type, colour);
        const copyNo = (copyCount.get(part) ?? 0) + 1;
        copyCount.set(part, copyNo);
        const wait = (1 + 90 * rnd() * rnd()) * HOUR;
        items.push({ member: memberIds[m]!, instance: copies.push({ part, copyNo, sentAt: Math.round(t - wait), status: "printed", reprints: 0 }) - 1, grams: 0, minutes: 0 });
      }
      const shares = items.map(() => 0.5 + rnd());
      const sum = shares.reduce((s, x) => s + x, 0);
      items.forEach((it, i) => {
        it.grams = Math.round((estG * shares[i]!) / sum * 10) / 10;
        it.minutes = Math.round((estMin * shares[i]!) / sum);
      });
      for (const it of items) {
        const c = copies[it.instance]!;
        c.status = failed ? "failed" : end < horizonEnd - 10 * 24 * HOUR ? "accepted" : "printed";
        if (failed) c.reprints += 1;
      }
      if (failed) pending.set(key, [...(pending.get(key) ?? []), ...items.map((it) => ({ ...it }))]);
      out.push({ printerId: p.id, status: failed ? "failed" : "finished", material: type, colour, start: t, end, estMin, actMin, estG, actG: failed || rnd() < 0.3 ? null : Math.round(estG * (0.95 + 0.12 * rnd()) * 10) / 10, reason: failed ? pick(reasons) : null, unattended: !cal.isOpen(end), items });
      t = end + (rnd() < 0.08 ? 24 + rnd() * 30 : 0.2 + rnd() * 2) * HOUR;
    }
  }

  // Write it all: assemblies and parts, copies, plates with their items, queue entries, history.
  const asm = await d.insert(assemblies).values(memberIds.map((id) => ({ ownerId: id, name: ARCHIVE, description: "Past work printed at Kettle Lane." }))).$returningId();
  const partRows = await d
    .insert(parts)
    .values(partKeys.map((k, i) => ({ assemblyId: asm[memberIds.indexOf(k.member)]!.id, name: k.name, quantity: Math.max(1, copyCount.get(i) ?? 1), material: k.type.toUpperCase(), colour: k.colour.toLowerCase(), layerHeightMm: 0.2, walls: 3, infillPercent: 15 })))
    .$returningId();
  const instanceIds: number[] = [];
  await batched(copies, 500, async (chunk) => {
    const ids = await d.insert(partInstances).values(chunk.map((c) => ({ partId: partRows[c.part]!.id, copyNo: c.copyNo, status: c.status, reprints: c.reprints }))).$returningId();
    instanceIds.push(...ids.map((r) => r.id));
  });
  await batched(copies.map((c, i) => ({ c, i })), 500, (chunk) => d.insert(queueEntries).values(chunk.map(({ c, i }) => ({ instanceId: instanceIds[i]!, memberId: partKeys[c.part]!.member, sentBy: partKeys[c.part]!.member, sentAt: new Date(c.sentAt) }))));
  // The kept quote, in the same shape live plates keep (material by weight, machine time, the fee).
  const currency = ws?.currency ?? "EUR";
  const rateOf = new Map(pr.map((p) => [p.id, p.rate]));
  const quoteOf = (p: Plate) => {
    const hourlyRateCents = rateOf.get(p.printerId) ?? 0;
    const totalGrams = p.items.reduce((s, it) => s + it.grams, 0);
    const totalMinutes = p.items.reduce((s, it) => s + it.minutes, 0);
    return {
      currency,
      materialName: p.material.toUpperCase(),
      pricePerKgCents: priceOf(p.material),
      hourlyRateCents,
      feeCents: ws?.fee ?? 0,
      startupMinutes: 0,
      items: p.items.map((it) => ({ instanceId: instanceIds[it.instance]!, memberId: it.member, grams: it.grams, minutes: it.minutes })),
      totalMinutes,
      totalGrams,
      cost: quoteCost({ grams: totalGrams, minutes: totalMinutes }, { hourlyRateCents }, { pricePerKgCents: priceOf(p.material) }, ws?.fee ?? 0),
    };
  };
  const plateIds: number[] = [];
  await batched(out, 250, async (chunk) => {
    const ids = await d
      .insert(plates)
      .values(chunk.map((p, i) => ({ printerId: p.printerId, status: p.status, material: p.material, colour: p.colour.toLowerCase(), plannedStart: new Date(p.start), plannedEnd: new Date(p.start + p.estMin * MIN), startedAt: new Date(p.start), endedAt: new Date(p.end), runsUnattended: p.unattended ? 1 : 0, estimatedMinutes: p.estMin, estimatedGrams: p.estG, actualMinutes: p.status === "finished" ? p.actMin : null, actualGrams: p.actG, shelfLabel: p.status === "finished" ? `Archive shelf ${1 + ((plateIds.length + i) % 12)}` : null, reason: p.reason, quote: quoteOf(p), quotedAt: new Date(p.start), createdAt: new Date(p.start), updatedAt: new Date(p.end) })))
      .$returningId();
    plateIds.push(...ids.map((r) => r.id));
  });
  const itemRows = out.flatMap((p, i) => p.items.map((it) => ({ plateId: plateIds[i]!, instanceId: instanceIds[it.instance]!, memberId: it.member, x: 5, y: 5, sizeX: 30, sizeY: 30, sizeZ: 20, minutes: it.minutes, grams: it.grams })));
  await batched(itemRows, 1000, (chunk) => d.insert(plateItems).values(chunk));
  const finished = out.map((p, i) => ({ p, id: plateIds[i]! })).filter((x) => x.p.status === "finished");
  await batched(finished, 500, (chunk) => d.insert(printHistory).values(chunk.map(({ p, id }) => ({ printerId: p.printerId, plateId: id, estimatedMinutes: p.estMin, actualMinutes: p.actMin, estimatedGrams: p.estG, actualGrams: p.actG, finishedAt: new Date(p.end) }))));
  await d.insert(printerMaintenance).values(maint.map((m) => ({ printerId: m.printerId, startsAt: new Date(m.start), endsAt: new Date(m.end), note: m.note })));

  // Charges per member and finished plate (material by weight, machine time, the plate fee), then
  // one payment per member and month, made on the 5th of the next month when that has passed.
  const chargeRows = finished.flatMap(({ p, id }) => {
    const totalG = p.items.reduce((s, it) => s + it.grams, 0) || 1;
    const grams = p.actG ?? p.estG;
    const byMember = new Map<number, number>();
    for (const it of p.items) byMember.set(it.member, (byMember.get(it.member) ?? 0) + it.grams / totalG);
    return [...byMember].map(([memberId, share]) => ({
      memberId,
      plateId: id,
      amountCents: Math.round(share * ((grams * priceOf(p.material)) / 1000 + (p.actMin / 60) * (rateOf.get(p.printerId) ?? 0) + (ws?.fee ?? 0))),
      currency,
      description: `Archive plate ${id}: ${p.material.toUpperCase()} ${p.colour.toLowerCase()}, ${Math.floor(p.actMin / 60)} h ${String(p.actMin % 60).padStart(2, "0")} min`,
      idempotencyKey: `history:plate:${id}:member:${memberId}`,
      createdAt: new Date(p.end),
    }));
  });
  await batched(chargeRows, 1000, (chunk) => d.insert(charges).ignore().values(chunk));
  const monthly = new Map<string, { memberId: number; cents: number; month: string }>();
  for (const c of chargeRows) {
    const month = localDateOf(c.createdAt.getTime(), tz).slice(0, 7);
    const k = `${c.memberId}:${month}`;
    monthly.set(k, { memberId: c.memberId, month, cents: (monthly.get(k)?.cents ?? 0) + c.amountCents });
  }
  const paid = [...monthly.values()]
    .map((m) => ({ ...m, at: localMidnight(`${addDays(`${m.month}-28`, 8).slice(0, 7)}-05`, tz) + 11 * HOUR }))
    .filter((m) => m.at < horizonEnd);
  if (paid.length) {
    await d.insert(payments).ignore().values(paid.map((m) => ({ memberId: m.memberId, amountCents: m.cents, currency, providerSessionId: `history_${m.memberId}_${m.month}`, providerEventId: `history_evt_${m.memberId}_${m.month}`, status: "paid" as const, createdAt: new Date(m.at - HOUR), paidAt: new Date(m.at) })));
  }
  return { plates: out.length };
}
