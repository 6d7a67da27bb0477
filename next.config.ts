import type { NextConfig } from "next";

const dev = process.env.NODE_ENV !== "production";

// The content security policy keeps everything on our own origin while still allowing what the
// app needs: the mesh web worker (served from our origin, or a blob: in dev), WebAssembly
// (manifold-3d: 'wasm-unsafe-eval'), the WebGL viewer (no extra source needed), and Next's inline
// bootstrap scripts ('unsafe-inline'; dev adds eval and the HMR socket).
const policy = (evalInScripts: boolean) => [
  "default-src 'self'",
  `script-src 'self' 'unsafe-inline' 'wasm-unsafe-eval'${dev || evalInScripts ? " 'unsafe-eval'" : ""}`,
  "style-src 'self' 'unsafe-inline'",
  "img-src 'self' data: blob:",
  "font-src 'self'",
  `connect-src 'self'${dev ? " ws: wss:" : ""}`,
  "worker-src 'self' blob:",
  "object-src 'none'",
  "base-uri 'self'",
  "form-action 'self'",
  "frame-ancestors 'none'",
].join("; ");
const csp = policy(false);
// A dedicated worker runs under the policy sent with its own script. The STEP tessellator's bindings
// (occt-import-js, built with embind) compile small glue functions with `new Function`, so the
// worker entry scripts, and only they, may evaluate strings: no page and no DOM is reachable there.
const workerCsp = policy(true);

const securityHeaders = [
  { key: "Content-Security-Policy", value: csp },
  { key: "X-Content-Type-Options", value: "nosniff" },
  { key: "X-Frame-Options", value: "DENY" },
  { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
  { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=()" },
  { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
];

const nextConfig: NextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  // occt-import-js (the STEP tessellator) finds its .wasm beside its own script, and piscina starts its
  // worker threads from its own files on disk: both are loaded from node_modules.
  serverExternalPackages: ["mysql2", "occt-import-js", "piscina"],
  allowedDevOrigins: ["127.0.0.1"],
  experimental: { authInterrupts: true },
  // `npm test` type-checks the whole tree as its own step (tsc --noEmit); the build need not repeat it.
  typescript: { ignoreBuildErrors: true },
  async headers() {
    return [
      { source: "/:path*", headers: securityHeaders },
      { source: "/_next/static/chunks/:file(turbopack-worker-[^/]+\\.js)", headers: [{ key: "Content-Security-Policy", value: workerCsp }] },
    ];
  },
};

export default nextConfig;
