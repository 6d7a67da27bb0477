"use client";
// The one no-SSR entry to the 3D view: three.js needs a browser, and pages stay server-rendered.
import dynamic from "next/dynamic";
import type { ViewerProps } from "./mesh-viewer";

export const Viewer = dynamic<ViewerProps>(() => import("./mesh-viewer").then((m) => m.MeshViewer), {
  ssr: false,
  loading: () => <div role="status" className="flex h-full items-center justify-center text-sm text-ink-soft">Starting the 3D view…</div>,
});

export type { ViewerProps };
