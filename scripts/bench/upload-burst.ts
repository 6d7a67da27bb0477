// Part of bench:load: eight members' worth of parallel 3MF uploads (one member, eight parts) while a
// client polls GET /api/health. The uploads are read and analysed in a worker thread, so health must
// stay fast meanwhile (before: eight tiny packages that inflated 200 MB each pushed health to 12.4 s).
import { write3mf } from "../../lib/mesh";

/** A closed UV sphere of radius 40 mm, `n` × `n` quads (2n² triangles), as an indexed mesh. */
function sphere(n: number) {
  const vertices: number[] = [];
  const indices: number[] = [];
  for (let i = 0; i <= n; i++) {
    const theta = (Math.PI * i) / n;
    for (let j = 0; j < n; j++) {
      const phi = (2 * Math.PI * j) / n;
      vertices.push(40 * Math.sin(theta) * Math.cos(phi), 40 * Math.sin(theta) * Math.sin(phi), 40 + 40 * Math.cos(theta));
    }
  }
  const at = (i: number, j: number) => i * n + (j % n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      if (i > 0) indices.push(at(i, j), at(i + 1, j), at(i, j + 1));
      if (i < n - 1) indices.push(at(i, j + 1), at(i + 1, j), at(i + 1, j + 1));
    }
  }
  return { vertices: new Float32Array(vertices), indices: new Uint32Array(indices) };
}

function percentile(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))] ?? NaN;
}

export async function uploadBurst(base: string, memberCookie: string, uploads = 8): Promise<boolean> {
  const pkg = write3mf([{ name: "bench sphere", mesh: sphere(300) }]);
  const send = (path: string, method: string, body?: unknown) =>
    fetch(`${base}${path}`, { method, headers: { cookie: memberCookie, origin: base, "content-type": "application/json" }, body: body === undefined ? undefined : JSON.stringify(body) }).then(async (r) => {
      if (r.status >= 300) throw new Error(`${method} ${path}: ${r.status} ${await r.text()}`);
      return (await r.json()) as { id: number };
    });
  const asm = await send("/api/assemblies", "POST", { name: `Upload burst ${Date.now()}` });
  const parts = await Promise.all(Array.from({ length: uploads }, (_, k) => send(`/api/assemblies/${asm.id}/parts`, "POST", { name: `Sphere ${k + 1}`, quantity: 1, material: "PLA" })));
  let done = false;
  const health: number[] = [];
  const poll = (async () => {
    while (!done) {
      const t0 = performance.now();
      await fetch(`${base}/api/health`).then((r) => r.arrayBuffer());
      health.push(performance.now() - t0);
      await new Promise((r) => setTimeout(r, 20));
    }
  })();
  const t0 = performance.now();
  const results = await Promise.all(
    parts.map(async (p) => {
      const s = performance.now();
      const r = await fetch(`${base}/api/parts/${p.id}/file?name=sphere.3mf`, { method: "PUT", headers: { cookie: memberCookie, origin: base, "content-type": "application/octet-stream" }, body: new Blob([pkg as Uint8Array<ArrayBuffer>]) });
      await r.arrayBuffer();
      return { status: r.status, ms: performance.now() - s };
    }),
  );
  const wall = performance.now() - t0;
  done = true;
  await poll;
  await send(`/api/assemblies/${asm.id}`, "DELETE").catch(() => undefined);
  health.sort((a, b) => a - b);
  const ms = results.map((r) => r.ms).sort((a, b) => a - b);
  console.log(`bench:load: ${uploads} parallel uploads of a ${(pkg.byteLength / 1024 / 1024).toFixed(1)} MB 3MF (${2 * 300 * 300 - 600} triangles) while polling /api/health (${wall.toFixed(0)} ms in all)`);
  console.table([
    { request: "PUT /api/parts/…/file", count: results.length, statuses: [...new Set(results.map((r) => r.status))].join(" "), "p50 ms": percentile(ms, 50).toFixed(0), "max ms": ms[ms.length - 1]!.toFixed(0) },
    { request: "GET /api/health", count: health.length, statuses: "200", "p50 ms": percentile(health, 50).toFixed(0), "max ms": health[health.length - 1]!.toFixed(0) },
  ]);
  const ok = results.every((r) => r.status === 201) && health[health.length - 1]! < 1_000;
  console.log(`upload burst: goal (all 201, health never over 1000 ms): ${ok ? "met" : "NOT met"}`);
  return ok;
}
