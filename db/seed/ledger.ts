// Demo charges for the invented Kettle Lane Workshop members, so the Ledger and Billing pages show
// something before any plate has been finished. Idempotent: each charge has a fixed idempotency key.
import { eq, inArray } from "drizzle-orm";
import type { MySql2Database } from "drizzle-orm/mysql2";
import * as schema from "../schema";

type D = MySql2Database<typeof schema>;
const { charges, users } = schema;

// Amounts in cents, invented: plate shares of filament, printer time and the plate fee.
const demoCharges: { email: string; key: string; amountCents: number; description: string; daysAgo: number }[] = [
  { email: "jun@kettlelane.example", key: "seed:jun:tide-clock-gears", amountCents: 1240, description: "Tide clock: gear train plate (PLA, 3 h 05 min)", daysAgo: 9 },
  { email: "jun@kettlelane.example", key: "seed:jun:tide-clock-case", amountCents: 385, description: "Tide clock: case clips plate (PETG, 0 h 50 min)", daysAgo: 4 },
  { email: "priya@kettlelane.example", key: "seed:priya:seed-tray", amountCents: 960, description: "Seed tray dividers plate (PLA, 2 h 20 min)", daysAgo: 6 },
  { email: "priya@kettlelane.example", key: "seed:priya:hinge-pins", amountCents: 210, description: "Greenhouse hinge pins plate (PETG, 0 h 35 min)", daysAgo: 2 },
];

export async function seedLedger(d: D): Promise<void> {
  const emails = [...new Set(demoCharges.map((c) => c.email))];
  const people = await d.select({ id: users.id, email: users.email }).from(users).where(inArray(users.email, emails));
  const idOf = new Map(people.map((p) => [p.email, p.id]));
  const [ws] = await d.select({ currency: schema.workshopSettings.currency }).from(schema.workshopSettings).where(eq(schema.workshopSettings.id, 1));
  const currency = ws?.currency ?? "EUR";
  for (const c of demoCharges) {
    const memberId = idOf.get(c.email);
    if (!memberId) continue;
    await d
      .insert(charges)
      .ignore()
      .values({ memberId, amountCents: c.amountCents, currency, description: c.description, idempotencyKey: c.key, createdAt: new Date(Date.now() - c.daysAgo * 86_400_000) });
  }
}
