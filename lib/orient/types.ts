/** Plain data shared by the orientation search and the split planner. */
import type { Vec3 } from "@/lib/mesh/types";
import type { Rotation } from "./rotation";

/** A workshop printer that takes the part's material, as the planner sees it: bed width × depth and build height, mm. */
export interface Printer {
  id: string;
  bed: [number, number];
  height: number;
}

export interface PrinterFit {
  printerId: string;
  fits: boolean;
  /** True when it only fits after a quarter turn about Z. */
  turned: boolean;
}

/** Checked between directions and candidates; an AbortSignal satisfies it. */
export interface CancelFlag {
  readonly aborted: boolean;
}

export type DirectionSource = "original" | "axis" | "flat" | "sphere";

export interface ScoreWeights {
  /** Per unit of support volume ÷ part volume. */
  support: number;
  /** Per unit of overhang area ÷ total surface area. */
  overhang: number;
  /** Per unit of height ÷ part diameter. */
  height: number;
  /** Per unit of missing bed contact (1 − contact ÷ reference contact, clamped at 0). */
  instability: number;
  /** Added once when the part fits none of the printers given (none given: never added). */
  noFit: number;
}

export interface OrientOptions {
  /** Self-supporting angle from vertical, degrees; default 45 (common practice). */
  overhangAngle?: number;
  /** Layer height for the layer count, mm; default 0.2. */
  layerHeight?: number;
  printers?: Printer[];
  /** Even spread over the sphere; default 256 (at least 200 is asked for). */
  sphereDirections?: number;
  /** Largest flat regions whose normals become candidates; default 24. */
  flatRegions?: number;
  /** How many best directions get the height-field support estimate; default 16. */
  refineCount?: number;
  /** Height-field cells along the longer footprint side; default 192. */
  gridCells?: number;
  /** Smallest height-field cell, mm; default 0.25. */
  minCellSize?: number;
  /** How many ranked candidates to return; default 5. */
  keep?: number;
  weights?: Partial<ScoreWeights>;
  onProgress?: (fraction: number) => void;
  signal?: CancelFlag;
}

export interface OrientationCandidate {
  /** Unit "down" direction in the file's frame; the rotation maps it to −Z. */
  down: Vec3;
  source: DirectionSource;
  rotation: Rotation;
  /** Facets steeper than the self-supporting angle, facets on the bed excluded, mm². */
  overhangArea: number;
  /** Height-field estimate of support material, mm³ (see README). */
  supportVolume: number;
  /** Height above the bed, mm, and layers at the given layer height. */
  height: number;
  layers: number;
  /** Area of facets resting on the bed, mm². */
  bedContactArea: number;
  /** Bounding rectangle on the bed after the chosen turn about Z, mm. */
  footprint: [number, number];
  fits: PrinterFit[];
  fitsAny: boolean;
  /** Lower is better; see README for the formula. */
  score: number;
  /** Rests on at least `contactRequired` mm² with its centre of mass over the contact (lib/rules/stability). */
  stable: boolean;
  contactRequired: number;
  /** Named in words (lib/rules/orientation-names): label, and the turn from the drawing. */
  label: string;
  turn: string;
}

export interface OrientationResult {
  /** Best first, at most `keep` of them, all different directions. */
  candidates: OrientationCandidate[];
  /** The file's own orientation (down = −Z of the file), scored the same way. */
  original: OrientationCandidate;
  /** Directions that went through the fast stage. */
  directionsEvaluated: number;
  /** Part volume and surface area used to normalise the score, mm³ and mm². */
  volume: number;
  surfaceArea: number;
}

export class SearchCancelledError extends Error {
  constructor() {
    super("search cancelled");
    this.name = "SearchCancelledError";
  }
}
