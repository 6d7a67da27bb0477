/**
 * Plain-number inputs and outputs of the estimates. Lengths in mm, areas in mm², volumes in mm³,
 * masses in g, durations in minutes unless a name says otherwise, money in integer cents.
 * See README.md beside this file for what each parameter means and its default.
 */

/** What the mesh engine measures of one part, in its printing orientation. */
export interface PartGeometry {
  /** Enclosed volume of the closed mesh. */
  volumeMm3: number;
  /** Total surface area. */
  areaMm2: number;
  /** Extent along the build direction (z). */
  heightMm: number;
  /** Area the part covers seen from above; when absent, half the surface area stands in. */
  footprintAreaMm2?: number;
  /** Volume of the region below overhangs that support would fill if printed solid. */
  supportVolumeMm3?: number;
}

/** Slicing choices that drive the amount of material. */
export interface PrintSettings {
  layerHeightMm: number;
  /** Number of perimeter lines around each layer. */
  wallCount: number;
  lineWidthMm: number;
  topLayers: number;
  bottomLayers: number;
  /** Infill fraction of the interior, 0..1. */
  infill: number;
  /** Fraction of the support region actually filled; absent or 0 means no support. */
  supportDensity?: number;
}

export interface PrinterProfile {
  /** Effective average extrusion rate over a whole print (below the hotend's melt limit). */
  volumetricFlowMm3s: number;
  /** Fixed cost of each layer: z move, travel, retraction, wipe. */
  perLayerSeconds: number;
  /** Once per plate: heating, levelling, priming. */
  startupMinutes: number;
  /** Machine time charge. */
  hourlyRateCents: number;
}

export interface MaterialPricing {
  densityGcm3: number;
  pricePerKgCents: number;
}

/** Correction learnt from finished plates of one printer (see calibration.ts). */
export interface CalibrationFactor {
  timeFactor: number;
  gramsFactor: number;
  /** Number of finished plates the time factor rests on. */
  samples: number;
  /** Number of finished plates with weighed grams the grams factor rests on. */
  gramsSamples: number;
}

export interface VolumeBreakdown {
  wallMm3: number;
  /** Top and bottom solid layers. */
  shellMm3: number;
  infillMm3: number;
  supportMm3: number;
  /** wall + shell + infill + support: everything that goes through the nozzle. */
  extrudedMm3: number;
  layers: number;
}

export interface CostBreakdown {
  materialCents: number;
  machineCents: number;
  feeCents: number;
  totalCents: number;
}

export interface TimeBreakdown {
  extrusionMinutes: number;
  layerMinutes: number;
  startupMinutes: number;
  /** Sum of the three lines above, before calibration. */
  rawMinutes: number;
  /** rawMinutes × calibration time factor. */
  minutes: number;
}

export interface PartEstimate {
  volumes: VolumeBreakdown;
  /** extruded volume × density, before calibration. */
  rawGrams: number;
  /** rawGrams × calibration grams factor. */
  grams: number;
  time: TimeBreakdown;
  calibration: CalibrationFactor;
  cost: CostBreakdown;
}
