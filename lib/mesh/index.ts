export * from "./types";
export { MeshReadError, isMeshReadError, type MeshReadErrorCode } from "./errors";
export { readMesh, stlScale, type MeshFormat, type ReadOptions, type ReadResult, type StlUnits } from "./read";
export {
  analyzeBytes,
  analyzeSoup,
  analyzeSoupWithMesh,
  analyzeStlBinaryFull,
  analyzeStlFast,
  passSoup,
  type MeshAnalysis,
} from "./analysis";
export type { AnalysisOptions } from "./options";
export type { PassResult } from "./single-pass";
export { weld } from "./weld";
export { sharedWorkspace, Workspace } from "./workspace";
export { topology, type Topology } from "./topology";
export { footprint, convexHull2d, polygonArea, type Footprint } from "./footprint";
export { writeStl } from "./stl-write";
export { write3mf, type ThreeMfObject } from "./threemf-write";
export { applyAffine, composeAffine, IDENTITY, type Affine } from "./affine";
export { UNIT_MM, type ThreeMfPart } from "./threemf-read";
export { isStep, readStepWith, STEP_ANGULAR_DEFLECTION_RAD, STEP_LINEAR_DEFLECTION_MM, type OcctModule } from "./step-read";
export { analysisToJson, type AnalysisJson, type ErrorJson } from "./json";
