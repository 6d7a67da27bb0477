// The client's cache contract for plates.
import { queryOptions } from "@tanstack/react-query";
import type { PlateDetail } from "@/lib/server/plate-export";
import type { Wire } from "./assemblies";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";
import { LIVE_POLL_MS } from "./queue";

export type PlateDetailWire = Wire<PlateDetail>;

export const plateQuery = (id: number) =>
  queryOptions({ queryKey: queryKeys.plates.detail(id), queryFn: () => fetchJson<PlateDetailWire>(`/api/plates/${id}`), refetchInterval: LIVE_POLL_MS, staleTime: 5_000 });
