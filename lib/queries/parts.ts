// The client's cache contract for parts, and the upload sender (XHR, so each file has a progress bar).
import { queryOptions } from "@tanstack/react-query";
import type { MyPartRow, PartDetail } from "@/lib/server/parts";
import type { UploadResult } from "@/lib/server/uploads";
import type { Wire } from "./assemblies";
import { ApiError, fetchJson } from "./client";
import { queryKeys } from "./keys";

export type PartDetailWire = Wire<PartDetail>;
export type MyPartWire = Wire<MyPartRow>;

export const partQuery = (id: number) =>
  queryOptions({ queryKey: queryKeys.parts.detail(id), queryFn: () => fetchJson<PartDetailWire>(`/api/parts/${id}`) });

export const myPartsQuery = () => queryOptions({ queryKey: queryKeys.parts.mine(), queryFn: () => fetchJson<MyPartWire[]>("/api/parts") });

export interface UploadCall {
  promise: Promise<UploadResult>;
  abort(): void;
}

/** PUTs the raw bytes; fetch() has no upload progress, XMLHttpRequest's upload.onprogress does. */
export function uploadPartFile(partId: number, file: File, units: "mm" | "in", onProgress: (fraction: number) => void): UploadCall {
  const xhr = new XMLHttpRequest();
  const promise = new Promise<UploadResult>((resolve, reject) => {
    const q = new URLSearchParams({ name: file.name, units });
    xhr.open("PUT", `/api/parts/${partId}/file?${q}`);
    xhr.setRequestHeader("content-type", "application/octet-stream");
    xhr.responseType = "json";
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) onProgress(e.loaded / e.total);
    };
    xhr.onload = () => {
      const body = xhr.response as (UploadResult & { error?: string; fieldErrors?: Record<string, string[]> }) | null;
      if (xhr.status >= 200 && xhr.status < 300 && body) resolve(body);
      else reject(new ApiError(body?.error ?? `The server answered ${xhr.status}.`, xhr.status, body?.fieldErrors));
    };
    xhr.onerror = () => reject(new ApiError("The upload was interrupted. Check your connection and try again.", 0));
    xhr.onabort = () => reject(new ApiError("Upload cancelled.", 0));
    xhr.send(file);
  });
  return { promise, abort: () => xhr.abort() };
}
