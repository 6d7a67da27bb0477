/**
 * When a split earns its place: a cut means a glue joint, a seam and another part to track, so it is
 * offered only when it makes a part fit a printer that it fits no other way, or when it saves a
 * real amount of support: at least 500 mm³ (about 0.6 g of PLA) and at least 10 % of the support the
 * whole part needs in its chosen orientation. Both thresholds are a judgement, no source.
 */
export const SPLIT_MIN_SAVED_MM3 = 500;
export const SPLIT_MIN_SAVED_SHARE = 0.1;

export interface SplitFigures {
  /** Support of the whole part in its chosen orientation, mm³. */
  supportBefore: number;
  /** Support of the pieces, each in its own best orientation, mm³. */
  supportAfter: number;
  allPiecesFit: boolean;
}

/** Saving and its share of the support before, from the same two figures the page shows. */
export function splitSaving(f: Pick<SplitFigures, "supportBefore" | "supportAfter">): { saved: number; share: number } {
  const saved = f.supportBefore - f.supportAfter;
  return { saved, share: f.supportBefore > 0 ? saved / f.supportBefore : 0 };
}

/** Offer this cut? `partFits`: the whole part fits some printer in some orientation. */
export function splitEarnsItsPlace(f: SplitFigures, partFits: boolean): boolean {
  if (!partFits) return f.allPiecesFit;
  const { saved, share } = splitSaving(f);
  return saved >= SPLIT_MIN_SAVED_MM3 && share >= SPLIT_MIN_SAVED_SHARE;
}
