/**
 * Orientation and split planning. The split planner needs an initialised manifold-3d module,
 * passed in by the caller; everything else is plain typed-array code.
 */
export { searchOrientations, searchOrientationsIndexed } from "./search";
export { applyOrientation, rotationForDown, rotationFromMatrix, matrixFromQuaternion, quaternionFromMatrix } from "./rotation";
export type { Mat3, Quat, Rotation } from "./rotation";
export { supportVolumeHeightField } from "./support";
export { fitPrinter, fitPrinters } from "./fit";
export { orientationScore, DEFAULT_WEIGHTS } from "./score";
export { planSplits, splitUntilFits, compareSplits } from "./split";
export type { SplitCandidate, SplitOptions, SplitPiece, SplitPlan } from "./split";
export { candidatePlanes, screenPlanes } from "./split-planes";
export type { CutPlane, PlaneKind } from "./split-planes";
export { solidFromSoup, soupFromSolid } from "./manifold-bridge";
export type { ManifoldWasm } from "./manifold-bridge";
export { SearchCancelledError } from "./types";
export type { CancelFlag, OrientOptions, OrientationCandidate, OrientationResult, Printer, PrinterFit, ScoreWeights } from "./types";
