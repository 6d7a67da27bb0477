/** Why a file could not be read. Codes are stable: the UI and the CLI branch on them. */
export type MeshReadErrorCode =
  | "EMPTY"
  | "TOO_SMALL"
  | "TRUNCATED"
  | "COUNT_MISMATCH"
  | "TOO_LARGE"
  | "NO_TRIANGLES"
  | "NON_FINITE"
  | "BAD_ASCII"
  | "UNKNOWN_FORMAT"
  | "BAD_ZIP"
  | "ZIP_BOMB"
  | "NOT_3MF"
  | "BAD_XML"
  | "DOCTYPE"
  | "BAD_MODEL"
  | "BAD_INDEX"
  | "BAD_UNIT"
  | "MISSING_PART"
  | "BAD_STEP"
  | "NO_SOLIDS"
  | "NEEDS_STEP_READER"
  | "CANCELLED";

export class MeshReadError extends Error {
  readonly code: MeshReadErrorCode;
  constructor(code: MeshReadErrorCode, message: string) {
    super(message);
    this.name = "MeshReadError";
    this.code = code;
  }
}

export function isMeshReadError(e: unknown): e is MeshReadError {
  return e instanceof MeshReadError || (typeof e === "object" && e !== null && (e as { name?: unknown }).name === "MeshReadError");
}
