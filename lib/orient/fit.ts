/** Does a footprint and height fit a printer? A quarter turn about Z is allowed. */
import type { Printer, PrinterFit } from "./types";

/** Slack for rounding in rotated coordinates, mm. */
const SLACK = 1e-6;

export function fitPrinter(footprint: readonly [number, number], height: number, p: Printer): PrinterFit {
  const [w, d] = footprint;
  const [bw, bd] = p.bed;
  const tallEnough = height <= p.height + SLACK;
  const straight = tallEnough && w <= bw + SLACK && d <= bd + SLACK;
  const turned = !straight && tallEnough && d <= bw + SLACK && w <= bd + SLACK;
  return { printerId: p.id, fits: straight || turned, turned };
}

export function fitPrinters(footprint: readonly [number, number], height: number, printers: readonly Printer[]): PrinterFit[] {
  return printers.map((p) => fitPrinter(footprint, height, p));
}
