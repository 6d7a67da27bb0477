// The client's cache contract for a part's orientation and split, and the calls that change them.
import { queryOptions } from "@tanstack/react-query";
import type { Quat } from "@/lib/orient/rotation";
import type { OrientationView, StoredOrientation } from "@/lib/server/orientation";
import type { acceptSplit, getSplitLinks } from "@/lib/server/split";
import type { OrientationPickInput, SplitAcceptInput } from "@/lib/validation/orientation";
import type { Wire } from "./assemblies";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

export type OrientationWire = Wire<OrientationView>;
export type SplitLinksWire = Wire<Awaited<ReturnType<typeof getSplitLinks>>>;
export type SplitAcceptWire = Wire<Awaited<ReturnType<typeof acceptSplit>>>;

export const orientationQuery = (partId: number) =>
  queryOptions({ queryKey: queryKeys.orientation.part(partId), queryFn: () => fetchJson<OrientationWire>(`/api/parts/${partId}/orientation`) });

export const splitLinksQuery = (partId: number) =>
  queryOptions({ queryKey: queryKeys.orientation.split(partId), queryFn: () => fetchJson<SplitLinksWire>(`/api/parts/${partId}/split`) });

export const pickOrientation = (partId: number, body: OrientationPickInput) =>
  fetchJson<Wire<StoredOrientation>>(`/api/parts/${partId}/orientation`, { method: "PUT", body: JSON.stringify(body) });

export const acceptSplitCall = (partId: number, body: SplitAcceptInput) =>
  fetchJson<SplitAcceptWire>(`/api/parts/${partId}/split`, { method: "POST", body: JSON.stringify(body) });

export const IDENTITY_QUAT: Quat = [0, 0, 0, 1];
