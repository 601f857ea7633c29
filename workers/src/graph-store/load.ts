// Load a prepared graph directory, whole or piece by piece. The big arrays land directly in SharedArrayBuffers (the
// iteration shares them with worker threads without copying). Every file is checked against meta.json (size, and
// sha256 unless verify is off) and the CSR structure is checked (offsets ascending and in range, sources below n),
// so a corrupt or truncated store fails with a message naming the file instead of producing wrong scores.

import { createHash } from "node:crypto";
import { open, readFile } from "node:fs/promises";
import { join } from "node:path";
import type { Graph, NodeIds } from "../core/graph";
import { markSourcesChecked } from "../core/pull-step";
import { GraphStoreError, STORE_FORMAT, STORE_VERSION, type StoredFile, type StoredPiece, type StoreMeta } from "./format";
import { graphBytes, runBytes, SharedHeap } from "../core/shared-heap";
import { HEAP_MIN_BYTES, sharedF64, sharedU32 } from "./shared";

export interface LoadOptions {
  /** Check each file's sha256 (default true). */
  verify?: boolean;
  /** Smallest graph (bytes of its arrays) loaded onto a shared heap (default 8 MiB). */
  heapMinBytes?: number;
}

export interface LoadedPiece {
  index: number;
  start: number;
  end: number;
  /** end-start+1 offsets relative to this piece's first edge. */
  offsets: Uint32Array;
  sources: Uint32Array;
  weights: Float64Array | null;
}

export class GraphStore {
  private constructor(
    readonly dir: string,
    readonly meta: StoreMeta,
    private readonly verify: boolean,
    private readonly heapMinBytes: number,
  ) {}

  static async open(dir: string, options: LoadOptions = {}): Promise<GraphStore> {
    let text: string;
    try {
      text = await readFile(join(dir, "meta.json"), "utf8");
    } catch {
      throw new GraphStoreError("missing", dir, "meta.json is missing (not a graph store, or not fully written)");
    }
    let meta: StoreMeta;
    try {
      meta = JSON.parse(text) as StoreMeta;
    } catch {
      throw new GraphStoreError("corrupt", dir, "meta.json is not valid JSON");
    }
    checkMeta(dir, meta);
    return new GraphStore(dir, meta, options.verify ?? true, options.heapMinBytes ?? HEAP_MIN_BYTES);
  }

  async loadIds(): Promise<NodeIds> {
    const { n, files } = this.meta;
    if (this.meta.idKind === "integer") {
      const ids = new BigUint64Array(n);
      await this.readInto(files.ids, ids, n * 8);
      return { kind: "integer", ids };
    }
    const offsets = new Uint32Array(n + 1);
    await this.readInto(files.idOffsets as StoredFile, offsets, (n + 1) * 4);
    const total = offsets[n];
    if (offsets[0] !== 0) throw this.corrupt("ids.offsets.u32 does not start at 0");
    for (let i = 0; i < n; i++) if (offsets[i + 1] < offsets[i]) throw this.corrupt(`ids.offsets.u32 decreases at ${i}`);
    const bytes = new Uint8Array(total);
    await this.readInto(files.ids, bytes, total);
    return { kind: "string", bytes, offsets };
  }

  async loadOutWeight(into: Float64Array = sharedF64(this.meta.n)): Promise<Float64Array> {
    await this.readInto(this.meta.files.outWeight, into, this.meta.n * 8);
    return into;
  }

  /** One piece on its own shared buffers. */
  async loadPiece(index: number): Promise<LoadedPiece> {
    const p = this.piece(index);
    const offsets = sharedU32(p.end - p.start + 1);
    const sources = sharedU32(p.edges);
    const weights = p.weights ? sharedF64(p.edges) : null;
    await this.readPiece(p, offsets, sources, weights);
    return { index, start: p.start, end: p.end, offsets, sources, weights };
  }

  /**
   * The whole graph; inOffsets, sources, weights and outWeight in one shared heap (runs borrow its free space), or
   * on SharedArrayBuffers when small or beyond 32-bit addressing.
   */
  async loadGraph(): Promise<Graph> {
    const { n, m, weighted, mergedEdges } = this.meta;
    const bytes = graphBytes(n, m, weighted);
    const heap = bytes >= this.heapMinBytes ? SharedHeap.create(bytes + runBytes(n)) : null;
    const inOffsets = heap ? heap.u32(n + 1) : sharedU32(n + 1);
    const sources = heap ? heap.u32(m) : sharedU32(m);
    const weights = weighted ? (heap ? heap.f64(m) : sharedF64(m)) : null;
    const local = new Uint32Array(Math.max(...this.meta.pieces.map((p) => p.end - p.start + 1), 1));
    let base = 0;
    for (const p of this.meta.pieces) {
      const len = p.end - p.start + 1;
      const offsets = local.subarray(0, len);
      await this.readPiece(p, offsets, sources.subarray(base, base + p.edges), weights ? weights.subarray(base, base + p.edges) : null);
      for (let i = 0; i < len; i++) inOffsets[p.start + i] = base + offsets[i];
      base += p.edges;
    }
    const outWeight = await this.loadOutWeight(heap ? heap.f64(n) : sharedF64(n));
    for (let u = 0; u < n; u++) if (!(outWeight[u] >= 0)) throw this.corrupt(`out-weight.f64 has an invalid value at node ${u}`);
    const graph: Graph = { n, m, inOffsets, sources, weights, outWeight, ids: await this.loadIds() };
    // Every piece's sources were checked below n as they were read.
    markSourcesChecked(sources, n);
    if (mergedEdges !== undefined) graph.mergedEdges = mergedEdges;
    if (heap) graph.heap = heap;
    return graph;
  }

  private piece(index: number): StoredPiece {
    const p = this.meta.pieces[index];
    if (!p) throw new RangeError(`piece must be in 0..${this.meta.pieces.length - 1}. Value: ${index}`);
    return p;
  }

  private async readPiece(p: StoredPiece, offsets: Uint32Array, sources: Uint32Array, weights: Float64Array | null): Promise<void> {
    const len = p.end - p.start + 1;
    await this.readInto(p.offsets, offsets, len * 4);
    if (offsets[0] !== 0 || offsets[len - 1] !== p.edges) throw this.corrupt(`${p.offsets.name} does not span 0..${p.edges}`);
    for (let i = 1; i < len; i++) if (offsets[i] < offsets[i - 1]) throw this.corrupt(`${p.offsets.name} decreases at ${i}`);
    await this.readInto(p.sources, sources, p.edges * 4);
    const n = this.meta.n;
    for (let e = 0; e < p.edges; e++) if (sources[e] >= n) throw this.corrupt(`${p.sources.name} names node ${sources[e]} (n = ${n})`);
    if (weights) {
      if (!p.weights) throw this.corrupt(`piece ${p.index} has no weights file`);
      await this.readInto(p.weights, weights, p.edges * 8);
      for (let e = 0; e < p.edges; e++) if (!(weights[e] >= 0 && weights[e] < Infinity)) throw this.corrupt(`${p.weights.name} has an invalid weight at ${e}`);
    }
  }

  /** Read a file straight into the memory of `into`, checking its size and (when verifying) its sha256. */
  private async readInto(file: StoredFile, into: ArrayBufferView, expectBytes: number): Promise<void> {
    if (file.bytes !== expectBytes) throw this.corrupt(`${file.name}: meta.json says ${file.bytes} bytes, expected ${expectBytes}`);
    const path = join(this.dir, file.name);
    const bytes = new Uint8Array(into.buffer, into.byteOffset, expectBytes);
    let fh;
    try {
      fh = await open(path, "r");
    } catch {
      throw new GraphStoreError("corrupt", this.dir, `${file.name} is missing`);
    }
    try {
      const { size } = await fh.stat();
      if (size !== expectBytes) throw this.corrupt(`${file.name} has ${size} bytes, expected ${expectBytes}`);
      for (let at = 0; at < expectBytes; ) {
        const { bytesRead } = await fh.read(bytes, at, Math.min(expectBytes - at, 1 << 26), at);
        if (bytesRead === 0) throw this.corrupt(`${file.name} ended early at byte ${at}`);
        at += bytesRead;
      }
    } finally {
      await fh.close();
    }
    if (this.verify && createHash("sha256").update(bytes).digest("hex") !== file.sha256)
      throw this.corrupt(`${file.name} does not match its checksum`);
  }

  private corrupt(why: string): GraphStoreError {
    return new GraphStoreError("corrupt", this.dir, why);
  }
}

/** Convenience: the whole graph and its meta. */
export async function loadGraphStore(dir: string, options: LoadOptions = {}): Promise<{ graph: Graph; meta: StoreMeta }> {
  const store = await GraphStore.open(dir, options);
  return { graph: await store.loadGraph(), meta: store.meta };
}

function checkMeta(dir: string, meta: StoreMeta): void {
  const bad = (why: string) => new GraphStoreError("corrupt", dir, `meta.json: ${why}`);
  if (meta === null || typeof meta !== "object" || meta.format !== STORE_FORMAT) throw bad(`format is not "${STORE_FORMAT}"`);
  if (meta.version !== STORE_VERSION)
    throw new GraphStoreError("version", dir, `format version ${String(meta.version)} is not supported (this build reads ${STORE_VERSION})`);
  const count = (v: unknown) => typeof v === "number" && Number.isSafeInteger(v) && v >= 0;
  if (!count(meta.n) || !count(meta.m)) throw bad("n and m must be non-negative integers");
  if (meta.m >= 2 ** 32 || meta.n >= 2 ** 32 - 1) throw bad("n or m exceeds 32-bit indexes");
  if (meta.mergedEdges !== undefined && !(count(meta.mergedEdges) && meta.mergedEdges <= meta.m && !meta.weighted))
    throw bad("mergedEdges must be an integer ≤ m on an unweighted graph");
  if (meta.idKind !== "integer" && meta.idKind !== "string") throw bad("idKind must be integer or string");
  if (!meta.files?.ids || !meta.files.outWeight || (meta.idKind === "string" && !meta.files.idOffsets)) throw bad("files are incomplete");
  if (!Array.isArray(meta.pieces)) throw bad("pieces must be a list");
  let next = 0;
  let edges = 0;
  for (const [i, p] of meta.pieces.entries()) {
    if (p.index !== i || p.start !== next || !(p.end > p.start) || !count(p.edges)) throw bad(`piece ${i} does not continue at node ${next}`);
    if (!p.offsets || !p.sources || (meta.weighted && !p.weights)) throw bad(`piece ${i} lists incomplete files`);
    next = p.end;
    edges += p.edges;
  }
  if (next !== meta.n) throw bad(`pieces cover nodes 0..${next}, not 0..${meta.n}`);
  if (edges !== meta.m) throw bad(`pieces hold ${edges} edges, not ${meta.m}`);
}
