/**
 * Working memory lent to one analysis at a time and kept for the next.
 *
 * A full analysis needs about 40 bytes of scratch per triangle (corner ids, tentative vertices,
 * the weld's sort, the edge census). Fresh typed arrays are zeroed pages the system has to map on
 * first touch, and on these machines that costs about as much as the arithmetic done in them, so
 * a worker or server that analyses one file after another keeps its scratch between files.
 *
 * Rules: at most one analysis holds the workspace (a second concurrent one gets fresh arrays);
 * nothing lent may escape the analysis (results are copies or fresh arrays); buffers over
 * `maxBytes` in total are not kept. `release()` hands everything back; `drop()` frees the memory.
 */
export class Workspace {
  private buffers = new Map<string, ArrayBuffer>();
  private lent = false;
  constructor(readonly maxBytes = 96 * 1024 * 1024) {}

  /** A lease on the workspace, or a lease of fresh arrays when it is already lent. */
  lease(): Lease {
    if (this.lent) return new Lease(null);
    this.lent = true;
    return new Lease(this);
  }

  /** Free the kept memory (the next analysis allocates again). */
  drop(): void {
    this.buffers.clear();
  }

  /** Bytes currently kept. */
  get keptBytes(): number {
    let n = 0;
    for (const b of this.buffers.values()) n += b.byteLength;
    return n;
  }

  /** @internal */
  buffer(key: string, bytes: number): ArrayBuffer {
    const have = this.buffers.get(key);
    if (have && have.byteLength >= bytes) return have;
    const b = new ArrayBuffer(bytes);
    if (this.keptBytes - (have?.byteLength ?? 0) + bytes <= this.maxBytes) this.buffers.set(key, b);
    else this.buffers.delete(key);
    return b;
  }

  /** @internal */
  giveBack(): void {
    this.lent = false;
  }
}

/** Typed arrays for one analysis. `zeroed` arrays are cleared; others hold old data until written. */
export class Lease {
  private done = false;
  constructor(private readonly ws: Workspace | null) {}

  int32(key: string, n: number, zeroed = false): Int32Array {
    if (!this.ws) return new Int32Array(n);
    const a = new Int32Array(this.ws.buffer(key, 4 * n), 0, n);
    if (zeroed) a.fill(0);
    return a;
  }

  uint32(key: string, n: number, zeroed = false): Uint32Array {
    if (!this.ws) return new Uint32Array(n);
    const a = new Uint32Array(this.ws.buffer(key, 4 * n), 0, n);
    if (zeroed) a.fill(0);
    return a;
  }

  float32(key: string, n: number): Float32Array {
    if (!this.ws) return new Float32Array(n);
    return new Float32Array(this.ws.buffer(key, 4 * n), 0, n);
  }

  uint8(key: string, n: number, zeroed = false): Uint8Array {
    if (!this.ws) return new Uint8Array(n);
    const a = new Uint8Array(this.ws.buffer(key, n), 0, n);
    if (zeroed) a.fill(0);
    return a;
  }

  release(): void {
    if (this.done) return;
    this.done = true;
    this.ws?.giveBack();
  }
}

/** Fresh arrays every time: for results that outlive the analysis. */
export const FRESH = new Lease(null);

/** The workspace analyses in this thread share (the mesh worker, the CLI, the server). */
export const sharedWorkspace = new Workspace();
