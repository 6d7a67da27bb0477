/** Does a footprint and height fit a printer? The workshop's rule (lib/rules/fit: bed less the margin, a quarter turn allowed, build height). */
import { envelopeFits } from "@/lib/rules/fit";
import type { Printer, PrinterFit } from "./types";

export function fitPrinter(footprint: readonly [number, number], height: number, p: Printer): PrinterFit {
  const r = envelopeFits({ footprint, height }, p.bed, p.height);
  return { printerId: p.id, fits: r.fits, turned: r.fits && r.turned };
}

export function fitPrinters(footprint: readonly [number, number], height: number, printers: readonly Printer[]): PrinterFit[] {
  return printers.map((p) => fitPrinter(footprint, height, p));
}
