/**
 * Reference data for the filament families a workshop is likely to stock: default density, the
 * range the cited source gives, and cautions the UI shows. The cautions are reminders; the
 * workshop's own rules and local codes come first.
 */

export type MaterialKey = "pla" | "petg" | "abs" | "asa" | "tpu" | "nylon" | "pc";

export type CautionKey = "ventilate" | "enclosure" | "dry-first";

export interface Caution {
  key: CautionKey;
  message: string;
}

export interface MaterialReference {
  key: MaterialKey;
  name: string;
  /** Default density in g/cm³, used until the workshop enters its spool's value. */
  densityGcm3: number;
  /** Range of the cited source, g/cm³ (equal ends when it gives a single value). */
  densityRangeGcm3: readonly [number, number];
  densitySource: string;
  cautions: readonly CautionKey[];
}

export const CAUTIONS: Readonly<Record<CautionKey, Caution>> = Object.freeze({
  ventilate: {
    key: "ventilate",
    message:
      "Gives off fumes when melted: print in a ventilated room or with extraction, as the workshop's rules and local codes require.",
  },
  enclosure: {
    key: "enclosure",
    message: "Warps and cracks in drafts: an enclosed printer is recommended.",
  },
  "dry-first": {
    key: "dry-first",
    message: "Takes up moisture from the air: dry the spool before use and keep it sealed.",
  },
});

export const MATERIALS: Readonly<Record<MaterialKey, MaterialReference>> = Object.freeze({
  pla: {
    key: "pla",
    name: "PLA",
    densityGcm3: 1.24,
    densityRangeGcm3: [1.24, 1.24],
    densitySource: "NatureWorks Ingeo 2003D and 4032D datasheets",
    cautions: [],
  },
  petg: {
    key: "petg",
    name: "PETG",
    densityGcm3: 1.27,
    densityRangeGcm3: [1.27, 1.27],
    densitySource: "Eastman Eastar 6763 datasheet (value from memory)",
    cautions: [],
  },
  abs: {
    key: "abs",
    name: "ABS",
    densityGcm3: 1.05,
    densityRangeGcm3: [1.04, 1.08],
    densitySource: "producers' datasheets",
    cautions: ["ventilate", "enclosure"],
  },
  asa: {
    key: "asa",
    name: "ASA",
    densityGcm3: 1.07,
    densityRangeGcm3: [1.07, 1.07],
    densitySource: "INEOS Luran S 778T datasheet",
    cautions: ["ventilate", "enclosure"],
  },
  tpu: {
    key: "tpu",
    name: "TPU",
    densityGcm3: 1.2,
    densityRangeGcm3: [1.12, 1.23],
    densitySource: "Elastollan and Pellethane datasheets",
    cautions: [],
  },
  nylon: {
    key: "nylon",
    name: "Nylon (PA6)",
    densityGcm3: 1.13,
    densityRangeGcm3: [1.12, 1.15],
    densitySource: "BASF Ultramid B40 datasheet",
    cautions: ["dry-first"],
  },
  pc: {
    key: "pc",
    name: "PC",
    densityGcm3: 1.2,
    densityRangeGcm3: [1.2, 1.22],
    densitySource: "encyclopaedic value",
    cautions: ["enclosure"],
  },
});

export const MATERIAL_KEYS: readonly MaterialKey[] = Object.freeze(
  Object.keys(MATERIALS) as MaterialKey[],
);

export function isMaterialKey(value: string): value is MaterialKey {
  return Object.prototype.hasOwnProperty.call(MATERIALS, value);
}

/** The caution texts of a material, in table order, for display. */
export function cautionsFor(key: MaterialKey): Caution[] {
  return MATERIALS[key].cautions.map((c) => CAUTIONS[c]);
}
