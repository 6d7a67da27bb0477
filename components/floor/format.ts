// Times on the Floor read in the workshop's own zone (Intl, ECMA-402), so every operator sees the same clock.
export function timeIn(iso: string | null | undefined, timezone: string, withDay = true): string {
  if (!iso) return "—";
  return new Intl.DateTimeFormat("en-GB", { timeZone: timezone, weekday: withDay ? "short" : undefined, day: withDay ? "numeric" : undefined, month: withDay ? "short" : undefined, hour: "2-digit", minute: "2-digit", hourCycle: "h23" }).format(new Date(iso));
}

/** Minutes as h:mm, the house format for durations. */
export function hmm(minutes: number): string {
  const m = Math.max(0, Math.round(minutes));
  return `${Math.floor(m / 60)}:${String(m % 60).padStart(2, "0")}`;
}

type SpoolName = { material: string; colour: string };
const spoolName = (s: SpoolName) => `${s.material.toUpperCase()}${s.colour && s.colour !== "any" ? ` ${s.colour.toLowerCase()}` : ""}`;

/** A plate's spool change in plain words, the way an operator says it at the printer. */
export function spoolChangeWords(change: { from: SpoolName | null; to: SpoolName } | null): string {
  if (!change) return "Spool already on";
  return change.from ? `Load ${spoolName(change.to)}; take ${spoolName(change.from)} off first` : `Load ${spoolName(change.to)} (no spool on the printer now)`;
}
