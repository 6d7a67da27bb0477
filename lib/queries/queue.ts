// The client's cache contract for the queue: the Floor board and each part's copies, polled every 10 s.
import { queryOptions } from "@tanstack/react-query";
import type { FloorBoard, PartScheduleRow } from "@/lib/server/queue";
import type { Wire } from "./assemblies";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

export type FloorBoardWire = Wire<FloorBoard>;
export type PartScheduleWire = Wire<PartScheduleRow>;

/** How often live views ask again (the brief's 10 s; an ETag keeps an unchanged answer cheap). */
export const LIVE_POLL_MS = 10_000;

export const floorBoardQuery = () =>
  queryOptions({ queryKey: queryKeys.queue.board(), queryFn: () => fetchJson<FloorBoardWire>("/api/queue/board"), refetchInterval: LIVE_POLL_MS, staleTime: 5_000 });

export const partScheduleQuery = (partId: number) =>
  queryOptions({ queryKey: queryKeys.queue.part(partId), queryFn: () => fetchJson<PartScheduleWire[]>(`/api/queue/parts/${partId}`), refetchInterval: LIVE_POLL_MS, staleTime: 5_000 });

export const sendJsonTo = <T,>(url: string, body: unknown) => fetchJson<T>(url, { method: "POST", body: JSON.stringify(body) });
