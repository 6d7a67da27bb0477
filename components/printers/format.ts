// Display helpers shared by the printer, material and quote views. Money is integer cents.

export function money(cents: number, currency: string): string {
  return new Intl.NumberFormat("en-GB", { style: "currency", currency }).format(cents / 100);
}

/** Minutes as h:mm, rounded to the minute. */
export function hmm(minutes: number): string {
  const m = Math.round(minutes);
  return `${Math.floor(m / 60)}:${String(m % 60).padStart(2, "0")}`;
}

export function grams(g: number): string {
  return `${g < 10 ? g.toFixed(1) : Math.round(g).toLocaleString("en-GB")} g`;
}

/** An instant as wall-clock time in the workshop's zone. */
export function inZone(iso: string, timezone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone: timezone, weekday: "short", day: "numeric", month: "short", hour: "2-digit", minute: "2-digit" }).format(new Date(iso));
}

export const stateLabel = { available: "Available", busy: "Busy", maintenance: "Under maintenance" } as const;
/** Icons beside the words, so colour is never the only signal. */
export const stateIcon = { available: "●", busy: "◐", maintenance: "⚒" } as const;
export const stateTone = {
  available: "bg-accent-wash text-accent-ink border-accent/30",
  busy: "bg-sheet text-ink border-rule",
  maintenance: "bg-warn-wash text-ink border-warn/40",
} as const;
