/**
 * Nearest-rank percentile: the smallest value v in the sample such that at least p of the values
 * are ≤ v, i.e. the value at rank ⌈p·n⌉ of the sorted sample (rank 1 for p = 0). This is the
 * definition SQL's PERCENTILE_DISC uses (the first value whose cumulative distribution ≥ p), so the
 * database and this helper agree. Source: the nearest-rank method as given in textbook treatments
 * of percentiles (e.g. the "Percentile" article's worked example on {15, 20, 35, 40, 50}).
 */
export function nearestRank(values: readonly number[], p: number): number | null {
  if (!(p >= 0 && p <= 1)) throw new Error(`percentile ${p} is not between 0 and 1`);
  if (values.length === 0) return null;
  const sorted = [...values].sort((a, b) => a - b);
  const rank = Math.max(1, Math.ceil(p * sorted.length - 1e-9));
  return sorted[rank - 1] ?? null;
}
