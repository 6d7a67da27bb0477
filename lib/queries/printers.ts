import { queryOptions } from "@tanstack/react-query";
import type { MaterialType, PrinterState } from "@/lib/validation/printers";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

/** A printer as the API sends it (dates as ISO strings). */
export interface PrinterDto {
  id: number;
  name: string;
  bedXMm: number;
  bedYMm: number;
  heightMm: number;
  nozzleMm: number;
  enclosed: boolean;
  hourlyRateCents: number;
  volumetricFlowMm3s: number;
  perLayerSeconds: number;
  startupMinutes: number;
  state: PrinterState;
  maintenanceNote: string;
  expectedBackAt: string | null;
  version: number;
  materials: MaterialType[];
  loadedSpool: { id: number; label: string; colour: string; materialId: number; materialName: string; materialType: MaterialType; gramsRemaining: number } | null;
  calibration: { timeFactor: number; gramsFactor: number; samples: number; gramsSamples: number };
}

export const printersQuery = () =>
  queryOptions({ queryKey: queryKeys.printers.list(), queryFn: () => fetchJson<PrinterDto[]>("/api/printers") });

export interface HoursDto {
  timezone: string;
  windows: { weekday: number; open: string; close: string }[];
  openNow: boolean;
  nextOpeningAt: string | null;
  nextOpeningLocal: string | null;
  closesAt: string | null;
}

export const hoursQuery = () => queryOptions({ queryKey: queryKeys.hours.all, queryFn: () => fetchJson<HoursDto>("/api/workshop/hours") });
