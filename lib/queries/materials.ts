import { queryOptions } from "@tanstack/react-query";
import type { MaterialType } from "@/lib/validation/printers";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

export interface SpoolDto {
  id: number;
  label: string;
  colour: string;
  gramsInitial: number;
  gramsRemaining: number;
  loadedPrinterId: number | null;
  loadedPrinterName: string | null;
  loadedAt: string | null;
  low: boolean;
  version: number;
}

export interface MaterialDto {
  id: number;
  name: string;
  type: MaterialType;
  densityGcm3: number;
  densitySource: string;
  pricePerKgCents: number;
  lowStockGrams: number;
  version: number;
  colours: string[];
  spools: SpoolDto[];
  gramsInStock: number;
  lowStock: boolean;
  cautions: { key: string; message: string }[];
}

export const materialsQuery = () =>
  queryOptions({ queryKey: queryKeys.materials.list(), queryFn: () => fetchJson<MaterialDto[]>("/api/materials") });
