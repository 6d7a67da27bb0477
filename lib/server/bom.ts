import "server-only";
import type { PartStatus } from "@/lib/rules/status";
import { getAssemblyDetail } from "./parts";
import type { SessionUser } from "./session";

const csvCell = (v: string | number | null) => {
  const s = v === null ? "" : String(v);
  // RFC 4180: quote cells holding commas, quotes or line breaks; double the quotes inside.
  // A leading = + - @ is prefixed so a spreadsheet does not run it as a formula (common practice, OWASP "CSV injection").
  const safe = /^[=+\-@]/.test(s) ? `'${s}` : s;
  return /[",\r\n]/.test(safe) ? `"${safe.replace(/"/g, '""')}"` : safe;
};

/** The bill of materials for an assembly and everything below it, as CSV (RFC 4180, CRLF). */
export async function bomCsv(user: SessionUser, id: number): Promise<{ filename: string; csv: string }> {
  const det = await getAssemblyDetail(user, id);
  const where = new Map(det.nodes.map((n) => [n.id, n.name]));
  const rows: (string | number | null)[][] = [["Type", "Name", "Sub-assembly", "Quantity", "Material or source", "Colour", "Status", "Unit price (cents)", "Due date", "Size as printed (mm)"]];
  // A split part is listed as its pieces only.
  for (const p of det.parts.filter((x) => !x.splitInto)) {
    const size = p.placed ? [p.placed.footprint[0], p.placed.footprint[1], p.placed.height].map((v) => Math.round(v * 10) / 10).join(" × ") : null;
    rows.push(["printed part", p.name, where.get(p.assemblyId) ?? "", p.quantity, p.material, p.colour, summarise(p.statuses), null, null, size]);
  }
  for (const i of det.items) {
    rows.push([i.kind === "hardware" ? "bought hardware" : "made elsewhere", i.name, where.get(i.assemblyId) ?? "", i.quantity, i.source, "", i.status.replace("_", " "), i.unitPriceCents, i.dueDate, null]);
  }
  const csv = rows.map((r) => r.map(csvCell).join(",")).join("\r\n") + "\r\n";
  const slug = det.assembly.name.toLowerCase().replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "") || "assembly";
  return { filename: `${slug}-bom.csv`, csv };
}

function summarise(statuses: PartStatus[]): string {
  const c = new Map<string, number>();
  for (const s of statuses) c.set(s, (c.get(s) ?? 0) + 1);
  return [...c].map(([s, n]) => `${n} ${s}`).join("; ");
}
