/** Formats an amount in the currency's smallest unit, with the unit's own number of decimals (ISO 4217 exponent). */
export function formatMoney(minorUnits: number, currency: string): string {
  const f = new Intl.NumberFormat("en-GB", { style: "currency", currency });
  const digits = f.resolvedOptions().maximumFractionDigits ?? 2;
  return f.format(minorUnits / 10 ** digits);
}
