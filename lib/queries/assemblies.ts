// The client's cache contract for assemblies: keys come from keys.ts, data shapes from the DAL.
import { queryOptions } from "@tanstack/react-query";
import type { AssemblySummary } from "@/lib/server/assemblies";
import type { AssemblyDetail } from "@/lib/server/parts";
import { fetchJson } from "./client";
import { queryKeys } from "./keys";

/** What JSON makes of a server value: dates arrive as ISO strings. */
export type Wire<T> = T extends Date ? string : T extends (infer U)[] ? Wire<U>[] : T extends object ? { [K in keyof T]: Wire<T[K]> } : T;

export type AssemblyDetailWire = Wire<AssemblyDetail>;

export const assembliesQuery = () =>
  queryOptions({ queryKey: queryKeys.assemblies.list(), queryFn: () => fetchJson<AssemblySummary[]>("/api/assemblies") });

export const assemblyQuery = (id: number) =>
  queryOptions({ queryKey: queryKeys.assemblies.detail(id), queryFn: () => fetchJson<AssemblyDetailWire>(`/api/assemblies/${id}`) });

export const sendJson = <T,>(url: string, method: "POST" | "PATCH" | "DELETE", body?: unknown) =>
  fetchJson<T>(url, { method, body: body === undefined ? undefined : JSON.stringify(body) });
