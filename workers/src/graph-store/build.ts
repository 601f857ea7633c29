// Build the in-memory Graph from canonically numbered edges: apply the self-loop, direction and duplicate policies,
// renumber nodes hubs first, and lay out the in-edge CSR with each in-list sorted by source.
// Dense ids: nodes ordered by out-arc count, descending (hubs first, so the gathers of the iteration touch few cache
// lines and pages), ties by original id; with renumber off, by original id alone. Either way the graph depends only on
// the set of input lines. Duplicate arcs stay adjacent in file order, so merged weights are summed in file order.

import type { Graph, NodeIds } from "../core/graph";
import { markSourcesChecked } from "../core/pull-step";
import type { ArcCounts, CanonicalEdges, EdgeSegment } from "../ingest/assemble";
import {
  balancedCuts,
  countValues,
  fillInLists,
  listsScratchBytes,
  NO_SOURCE,
  relabelArcs,
  scatterBySource,
  scatterByTarget,
  touchPages,
  type ListsWasm,
  type PassA,
  type PassB,
  type PassCount,
  type PassD,
  type PassRelabel,
  type PassSegment,
  type PassTouch,
} from "./build-passes";
import { graphBytes, runBytes, SharedHeap } from "../core/shared-heap";
import { HEAP_MIN_BYTES, sharedF64, sharedU32 } from "./shared";
import { assemblyModule } from "../tasks/assembly";

export interface BuildPolicy {
  directed: boolean;
  selfLoops: "drop" | "keep";
  duplicates: "merge" | "keep";
  /** Renumber hubs first (default) or keep original-id order. */
  renumber: boolean;
  /**
   * How merged duplicates of an unweighted file are stored: as a weight per edge (default), or as repeated sources
   * when at most half the arcs are duplicates (4 bytes per extra arc instead of 8 per edge; same transition matrix
   * for runs that use weights, see Graph.mergedEdges).
   */
  duplicateLayout?: "weights" | "repeats";
  /** Smallest graph (bytes of its arrays) built onto a shared heap; smaller ones use plain shared buffers. */
  heapMinBytes?: number;
  /** Bytes of in-lists per target bucket of a directed unweighted build (default 512 KiB; tests make it small). */
  bucketBytes?: number;
  /**
   * A run follows on the same threads (a command line): once the build's passes are done, one thread faults in the
   * heap's run space that the build's scratch did not reach, while this thread finishes the graph.
   */
  touchRunSpace?: boolean;
}

/** In- and out-degree of every node (edges after the policies; merged duplicates once). */
export interface NodeDegrees {
  in: Uint32Array;
  out: Uint32Array;
}

export interface BuildReport {
  /** Arcs after the self-loop policy and undirected doubling, before duplicates were merged. */
  arcs: number;
  selfLoopsDropped: number;
  /** Arcs folded into an earlier identical arc (weights summed). */
  duplicatesMerged: number;
  order: "out-degree" | "id";
}

export type PassTask =
  | { kind: "count"; task: PassCount }
  | { kind: "a"; task: PassA }
  | { kind: "b"; task: PassB }
  | { kind: "d"; task: PassD }
  | { kind: "relabel"; task: PassRelabel }
  | { kind: "touch"; task: PassTouch };

/** Runs one pass's slices (on worker threads, or here); resolves with each slice's result (merged arcs for pass B). */
export interface PassRunner {
  slices: number;
  run(tasks: PassTask[]): Promise<number[]>;
}

export const LOCAL_RUNNER: PassRunner = {
  slices: 1,
  run: async (tasks) => tasks.map((t) => runPass(t)),
};

export function runPass(t: PassTask): number {
  if (t.kind === "count") {
    countValues(t.task);
    return 0;
  }
  if (t.kind === "a") {
    scatterBySource(t.task);
    return 0;
  }
  if (t.kind === "d") return scatterByTarget(t.task);
  if (t.kind === "relabel") {
    relabelArcs(t.task);
    return 0;
  }
  if (t.kind === "touch") return touchPages(t.task);
  return fillInLists(t.task);
}

/**
 * A big graph's heap, made before its node count is known, with the sources carved first: their pages are faulted in
 * on an idle worker thread while this thread numbers the nodes (fresh memory is slow to fault in; see
 * docs/decisions/004-graph-memory.md). The build calls stop() when it needs the threads, and nothing may write the
 * sources before `touched` settles.
 */
export interface GraphReserve {
  heap: SharedHeap;
  sources: Uint32Array;
  stop(): void;
  touched: Promise<unknown>;
}

/**
 * The heap for a graph of at most `nodes` nodes and exactly `arcs` arcs (see BuildPolicy.heapMinBytes for when it
 * gets one), or null. With a runner of worker threads, the sources' pages start being faulted in on one of them.
 */
export function reserveGraph(nodes: number, arcs: number, wide: boolean, policy: BuildPolicy, runner: PassRunner): GraphReserve | null {
  const bytes = graphBytes(nodes, arcs, wide);
  if (bytes < (policy.heapMinBytes ?? HEAP_MIN_BYTES) || arcs >= 2 ** 32) return null;
  const heap = SharedHeap.create(bytes + runBytes(nodes));
  if (!heap) return null;
  const sources = heap.u32(arcs);
  const stop = new Int32Array(new SharedArrayBuffer(4));
  const from = sources.byteOffset;
  const to = from + sources.byteLength;
  let touched: Promise<unknown> = Promise.resolve();
  if (runner !== LOCAL_RUNNER && to > from) {
    touched = runner.run([{ kind: "touch", task: { buffer: heap.buffer, from, to, parts: runner.slices, stop } }]);
    // Whoever awaits it sees a failure; left alone (the ingest failed first), it must not surface on its own.
    touched.catch(() => {});
  }
  return { heap, sources, stop: () => Atomics.store(stop, 0, 1), touched };
}

export async function buildGraph(
  input: CanonicalEdges,
  policy: BuildPolicy,
  runner: PassRunner = LOCAL_RUNNER,
  reserve: GraphReserve | null = null,
): Promise<{ graph: Graph; report: BuildReport; degrees?: NodeDegrees }> {
  const built = await buildCsr(input, policy, runner, reserve);
  // Once every array of the graph is carved, so that the touch meets no write but the run's.
  const heap = built.graph.heap;
  if (heap && policy.touchRunSpace && runner !== LOCAL_RUNNER) touchRunSpace(heap, built.graph.n, runner);
  // Every source is a relabelled node id, below n by construction: runs need not scan them again.
  markSourcesChecked(built.graph.sources, built.graph.n);
  return built;
}

async function buildCsr(
  input: CanonicalEdges,
  policy: BuildPolicy,
  runner: PassRunner,
  reserve: GraphReserve | null,
): Promise<{ graph: Graph; report: BuildReport; degrees?: NodeDegrees }> {
  const n = input.n;
  const dropSelf = policy.selfLoops === "drop";
  const both = !policy.directed;
  // Segments cut into pieces whose partition scratch fits in cache (views: order and contents unchanged).
  const pieces = cutSegments(input.segments, PIECE_ARCS);
  const weighted = pieces.some((s) => s.weight !== null);
  const merge = policy.duplicates === "merge";
  if (n >= 2 ** 32 - 1) throw new RangeError(`too many nodes for 32-bit indexes: ${n}`);
  const counts = input.degrees ?? countArcs(input, dropSelf, both);
  const arcs = counts.arcs;
  if (arcs >= 2 ** 32) throw new RangeError(`too many edges for 32-bit offsets: ${arcs}`);
  const slices = Math.max(1, Math.min(runner.slices, n));
  if (reserve && reserve.sources.length !== arcs) {
    throw new Error(`build: ${reserve.sources.length} arcs were reserved, ${arcs} counted`);
  }
  const bytes = graphBytes(n, arcs, weighted || merge);
  const heap = reserve ? reserve.heap : bytes >= (policy.heapMinBytes ?? HEAP_MIN_BYTES) ? SharedHeap.create(bytes + runBytes(n)) : null;
  const finalU32 = (length: number) => (heap ? heap.u32(length) : sharedU32(length));
  const finalF64 = (length: number) => (heap ? heap.f64(length) : sharedF64(length));
  // The sources come first on the heap (see GraphReserve); their pages may still be being faulted in.
  const sources = reserve ? reserve.sources : finalU32(arcs);
  const sourcesReady = reserve ? reserve.touched : Promise.resolve();

  // Arrays whose every slot is written go over the numbering's spare tables while they last (pages in memory already).
  const spare = [...(input.spare ?? [])];
  const room = (length: number): Uint32Array => {
    const k = spare.findIndex((t) => t.length >= length);
    return k >= 0 ? spare.splice(k, 1)[0].subarray(0, length) : sharedU32(length);
  };
  const { perm, outByFinal } = policy.renumber ? hubsFirst(counts.out, room) : { perm: identity(n), outByFinal: Uint32Array.from(counts.out) };
  const inOffsets = finalU32(n + 1);
  for (let c = 0; c < n; c++) inOffsets[perm[c] + 1] = counts.in[c];
  for (let v = 0; v < n; v++) inOffsets[v + 1] += inOffsets[v];

  // Relabel the parsed arcs in place to final ids, segments split across slices by arc count. The parsed arrays are
  // the build's own from here on. For the direct unweighted build the same pass partitions each segment by target
  // bucket (see PassRelabel).
  const buckets = !weighted && policy.directed ? bucketCount(arcs, slices, policy.bucketBytes ?? BUCKET_BYTES) : 1;
  const bucketCuts = Uint32Array.from(balancedCuts((v) => inOffsets[v], n, buckets));
  const bucketOfFinal = buckets > 1 ? new Uint8Array(n) : null;
  if (bucketOfFinal) for (let j = 0; j < buckets; j++) bucketOfFinal.fill(j, bucketCuts[j], bucketCuts[j + 1]);
  const starts = buckets > 1 ? sharedU32(pieces.length * (buckets + 1)) : null;
  const fmaps = new Map<Uint32Array, { fmap: Uint32Array; bucket?: Uint8Array }>();
  const relabel = pieces.map((seg, k) => {
    let f = fmaps.get(seg.map);
    if (!f) {
      const fmap = compose(perm, seg.map, room(seg.map.length));
      f = { fmap, ...(bucketOfFinal ? { bucket: composeBytes(bucketOfFinal, fmap) } : {}) };
      fmaps.set(seg.map, f);
    }
    return { src: seg.src, dst: seg.dst, ...f, ...(starts ? { starts: segmentStarts(starts, k, buckets) } : {}) };
  });
  reserve?.stop();
  // Worker lanes partition in WebAssembly, in memory of their own that they keep for later builds.
  const lanes = runner !== LOCAL_RUNNER && bucketOfFinal ? assemblyModule("lane-passes") : undefined;
  await runner.run(splitByLength(relabel, slices).map((part) => ({ kind: "relabel" as const, task: { segments: part, lanes } })));
  fmaps.clear();
  const segments: PassSegment[] = pieces.map((seg) => ({ src: seg.src, dst: seg.dst, weight: seg.weight }));
  const ids = () => permuteIds(input.ids, perm);
  const reportOf = (merged: number): BuildReport => ({
    arcs,
    selfLoopsDropped: counts.selfLoopsDropped,
    duplicatesMerged: merged,
    order: policy.renumber ? "out-degree" : "id",
  });

  if (!weighted) {
    // Unweighted: arcs straight into their in-lists, lists sorted, duplicates counted; W_u = arc count.
    const outWeight = finalF64(n);
    // Each slice does a run of buckets (its own target ranges); unpartitioned, one range per slice.
    const cuts = buckets > 1 ? bucketCuts : Uint32Array.from(balancedCuts((v) => inOffsets[v], n, slices));
    const ranges = buckets > 1 ? buckets : slices;
    const firstOf = (k: number) => Math.floor((k * ranges) / slices);
    const dSegments = segments.map((seg, k) => (starts ? { ...seg, starts: segmentStarts(starts, k, buckets) } : seg));
    // On a heap, the bucketed build works in the space a run borrows later (its pages are then faulted in already)
    // and orders buckets in WebAssembly, when that space holds its arrays.
    let maxBucket = 0;
    for (let j = 0; j < buckets; j++) maxBucket = Math.max(maxBucket, inOffsets[cuts[j + 1]] - inOffsets[cuts[j]]);
    const scratchBytes = listsScratchBytes(maxBucket);
    const loanBytes = 4 * (n + 16) * (1 + (merge ? 1 + slices : 0)) + slices * (scratchBytes + 64);
    const listsModule = heap && buckets > 1 && loanBytes <= heap.free ? assemblyModule("order-lists") : null;
    const loan = listsModule && heap ? heap.lend() : null;
    const work = (length: number) => (loan ? loan.heap.u32(length) : sharedU32(length));
    const fill = work(n);
    fill.set(inOffsets.subarray(0, n));
    // Repeats are counted per node only when duplicates merge (the degrees then count them once).
    const inDistinct = merge ? work(n) : null;
    const dupOut = Array.from({ length: slices }, () => (merge ? work(n) : null));
    const lists = (): ListsWasm | undefined =>
      loan && listsModule
        ? { module: listsModule, memory: loan.heap.memory, scratch: work(scratchBytes / 4).byteOffset, scratchArcs: maxBucket }
        : undefined;
    await sourcesReady;
    const dupsBySlice = await runner.run(
      dupOut.map((own, k) => ({
        kind: "d" as const,
        task: {
          segments: dSegments,
          cuts,
          first: firstOf(k),
          last: firstOf(k + 1),
          dropSelf,
          both,
          inOffsets,
          fill,
          sources,
          inDistinct,
          dupOut: own,
          lists: lists(),
        },
      })),
    );
    const dups = dupsBySlice.reduce((a, b) => a + b, 0);
    // Out-arc counts in final order, read in sequence (not scattered through perm).
    const outDegree = outByFinal;
    for (let u = 0; u < n; u++) outWeight[u] = outDegree[u];
    if (dups > 0) for (const slice of dupOut) if (slice !== null) for (let u = 0; u < n; u++) outDegree[u] -= slice[u];
    // Degrees of the graph as the policy defines it: merged duplicates count once. (Out of the borrowed space, which
    // the graph's runs reuse.)
    const degrees = { in: inDistinct ? Uint32Array.from(inDistinct) : lengths(inOffsets), out: outDegree };
    loan?.release();
    const base = { n, inOffsets, outWeight, ids: ids(), ...(heap ? { heap } : {}) };
    if (!merge || dups === 0) {
      return { graph: { ...base, m: arcs, sources, weights: null }, report: reportOf(0), degrees };
    }
    if (policy.duplicateLayout === "repeats" && 2 * dups <= arcs) {
      const distinctInOffsets = new Uint32Array(n + 1);
      for (let v = 0; v < n; v++) distinctInOffsets[v + 1] = distinctInOffsets[v] + degrees.in[v];
      const graph: Graph = { ...base, m: arcs, sources, weights: null, mergedEdges: arcs - dups, distinctInOffsets };
      return { graph, report: reportOf(dups), degrees };
    }
    const weights = finalF64(arcs - dups);
    const m = mergeUnitArcs(n, inOffsets, sources, weights);
    return { graph: { ...base, m, sources: sources.subarray(0, m), weights }, report: reportOf(arcs - m), degrees };
  }

  // Weighted: pass A, sliced by canonical source ranges of about equal arc counts, then pass B.
  const outStart = sharedU32(n + 1);
  for (let u = 0; u < n; u++) outStart[u + 1] = outByFinal[u];
  for (let u = 0; u < n; u++) outStart[u + 1] += outStart[u];
  const bySrcDst = sharedU32(arcs);
  const bySrcW = sharedF64(arcs);
  const cursor = sharedU32(n);
  cursor.set(outStart.subarray(0, n));
  const aCuts = balancedCuts((u) => outStart[u], n, slices);
  await runner.run(
    aCuts.slice(0, -1).map((uLo, k) => {
      const uHi = aCuts[k + 1];
      return {
        kind: "a" as const,
        task: {
          segments,
          uLo,
          uHi,
          dropSelf,
          both,
          cursor,
          bySrcDst,
          bySrcW,
        },
      };
    }),
  );

  // Pass B, sliced by target ranges of about equal in-arc counts (and source ranges for the out-weights); duplicates
  // merge as they are placed.
  const weights = finalF64(arcs);
  const outWeight = finalF64(n);
  const fillLast = sharedU32(2 * n);
  for (let v = 0; v < n; v++) {
    fillLast[2 * v] = inOffsets[v];
    fillLast[2 * v + 1] = NO_SOURCE;
  }
  const vCuts = balancedCuts((v) => inOffsets[v], n, slices);
  const uCuts = balancedCuts((u) => outStart[u], n, slices);
  await sourcesReady;
  const mergedBySlice = await runner.run(
    vCuts.slice(0, -1).map((vLo, k) => ({
      kind: "b" as const,
      task: {
        n,
        vLo,
        vHi: vCuts[k + 1],
        uLo: uCuts[k],
        uHi: uCuts[k + 1],
        merge,
        outStart,
        bySrcDst,
        bySrcW,
        fillLast,
        sources,
        weights,
        outWeight,
      },
    })),
  );
  const merged = mergedBySlice.reduce((a, b) => a + b, 0);
  const m = merged > 0 ? compact(n, inOffsets, fillLast, sources, weights) : arcs;
  const graph: Graph = {
    n,
    m,
    inOffsets,
    sources: m === arcs ? sources : sources.subarray(0, m),
    weights: m === arcs ? weights : weights.subarray(0, m),
    outWeight,
    ids: ids(),
    ...(heap ? { heap } : {}),
  };
  return { graph, report: reportOf(merged) };
}

/**
 * Faults in the run space beyond what the build wrote, on one thread, without waiting: the next run's first step would
 * otherwise fault those pages on both threads (it writes x and c there, 16 bytes a node). Atomic touches (4-byte compare-exchanges of
 * 0 with 0), as the run may start writing its arrays there meanwhile; a run whose step reaches that thread first waits
 * for the touch to end.
 */
function touchRunSpace(heap: SharedHeap, n: number, runner: PassRunner): void {
  const from = Math.ceil(heap.writtenEnd / 4096) * 4096;
  const to = Math.min(heap.capacity, heap.capacity - heap.free + runBytes(n));
  if (to <= from) return;
  const task = { buffer: heap.buffer, from, to, parts: 1, stop: new Int32Array(new SharedArrayBuffer(4)), atomic: true };
  runner.run([{ kind: "touch", task }]).catch(() => {});
}

/**
 * Target buckets of the partitioned build: in-lists of about `bytes` each (half the L2 cache of the machines we
 * measure on, so a bucket's lists and its gathered arcs stay in cache), at most 256 (a byte per stored value), and at
 * least 4 per slice or none: smaller graphs scatter list by list.
 */
const BUCKET_BYTES = 1 << 19;
function bucketCount(arcs: number, slices: number, bytes: number): number {
  const b = Math.min(256, Math.ceil((arcs * 4) / bytes));
  return b >= 4 * slices ? b : 1;
}

function segmentStarts(starts: Uint32Array, k: number, buckets: number): Uint32Array {
  return starts.subarray(k * (buckets + 1), (k + 1) * (buckets + 1));
}

function lengths(offsets: Uint32Array): Uint32Array {
  const out = new Uint32Array(offsets.length - 1);
  for (let v = 0; v < out.length; v++) out[v] = offsets[v + 1] - offsets[v];
  return out;
}

/** Arcs per piece of a segment: a piece's partition scratch (9 bytes an arc) stays within an L2 cache. */
const PIECE_ARCS = 1 << 16;

function cutSegments(segments: EdgeSegment[], arcs: number): EdgeSegment[] {
  return segments.flatMap((seg) => {
    const out: EdgeSegment[] = [];
    for (let a = 0; a < seg.src.length || a === 0; a += arcs) {
      const b = Math.min(seg.src.length, a + arcs);
      out.push({ ...seg, src: seg.src.subarray(a, b), dst: seg.dst.subarray(a, b), weight: seg.weight ? seg.weight.subarray(a, b) : null });
    }
    return out;
  });
}

/** Split items into `parts` runs of consecutive items with about equal total length (some runs may be empty). */
function splitByLength<T extends { src: Uint32Array }>(items: T[], parts: number): T[][] {
  const total = items.reduce((a, it) => a + it.src.length, 0);
  const out: T[][] = Array.from({ length: parts }, () => []);
  let seen = 0;
  for (const it of items) {
    out[Math.min(parts - 1, Math.floor((seen * parts) / Math.max(1, total)))].push(it);
    seen += it.src.length;
  }
  return out;
}

/** Arc counts by canonical id (the hash path; the direct path counts while numbering). */
function countArcs(input: CanonicalEdges, dropSelf: boolean, both: boolean): ArcCounts {
  const n = input.n;
  const out = new Uint32Array(n);
  const inn = new Uint32Array(n);
  let arcs = 0;
  let dropped = 0;
  for (const { src, dst, map } of input.segments) {
    for (let i = 0; i < src.length; i++) {
      const u = map[src[i]];
      const v = map[dst[i]];
      if (u === v && dropSelf) {
        dropped++;
        continue;
      }
      out[u]++;
      inn[v]++;
      arcs++;
      if (both && u !== v) {
        out[v]++;
        inn[u]++;
        arcs++;
      }
    }
  }
  return { out, in: inn, arcs, selfLoopsDropped: dropped };
}

/** Close the gaps merged duplicates left at the end of in-lists; rewrites inOffsets, returns the edge count. */
function compact(n: number, inOffsets: Uint32Array, fillLast: Uint32Array, sources: Uint32Array, weights: Float64Array): number {
  let wr = 0;
  for (let v = 0; v < n; v++) {
    const start = inOffsets[v];
    const end = fillLast[2 * v];
    inOffsets[v] = wr;
    if (start !== wr) {
      sources.copyWithin(wr, start, end);
      weights.copyWithin(wr, start, end);
    }
    wr += end - start;
  }
  inOffsets[n] = wr;
  return wr;
}

/**
 * Fold each run of equal sources in an in-list into one arc weighing the run's length (unit weights summed: the
 * transition probabilities do not change). In place; rewrites inOffsets; returns the edge count.
 */
function mergeUnitArcs(n: number, inOffsets: Uint32Array, sources: Uint32Array, weights: Float64Array): number {
  let wr = 0;
  for (let v = 0; v < n; v++) {
    const start = inOffsets[v];
    const end = inOffsets[v + 1];
    inOffsets[v] = wr;
    let prev = NO_SOURCE;
    for (let e = start; e < end; e++) {
      const u = sources[e];
      if (u === prev) weights[wr - 1] += 1;
      else {
        sources[wr] = u;
        weights[wr] = 1;
        wr++;
        prev = u;
      }
    }
  }
  inOffsets[n] = wr;
  return wr;
}

/**
 * perm[c] = final id: out-arc count descending, then canonical id ascending (stable counting sort); and the out-arc
 * counts in final order (outCount sorted descending), made without a pass through perm.
 */
export function hubsFirst(
  outCount: Uint32Array,
  room: (length: number) => Uint32Array = (length) => new Uint32Array(length),
): { perm: Uint32Array; outByFinal: Uint32Array } {
  const n = outCount.length;
  let maxDeg = 0;
  for (let c = 0; c < n; c++) if (outCount[c] > maxDeg) maxDeg = outCount[c];
  // Every slot of both is written.
  const perm = room(n);
  const outByFinal = room(n);
  if (maxDeg <= 4 * n + 1024) {
    const start = new Uint32Array(maxDeg + 2);
    for (let c = 0; c < n; c++) start[maxDeg - outCount[c] + 1]++;
    for (let k = 0; k <= maxDeg; k++) start[k + 1] += start[k];
    for (let k = 0; k <= maxDeg; k++) if (start[k + 1] > start[k]) outByFinal.fill(maxDeg - k, start[k], start[k + 1]);
    for (let c = 0; c < n; c++) perm[c] = start[maxDeg - outCount[c]]++;
    return { perm, outByFinal };
  }
  const order = identity(n).sort((a, b) => outCount[b] - outCount[a] || a - b);
  for (let i = 0; i < n; i++) {
    perm[order[i]] = i;
    outByFinal[i] = outCount[order[i]];
  }
  return { perm, outByFinal };
}

function identity(n: number): Uint32Array {
  const a = new Uint32Array(n);
  for (let i = 0; i < n; i++) a[i] = i;
  return a;
}

function compose(outer: Uint32Array, inner: Uint32Array, r: Uint32Array = sharedU32(inner.length)): Uint32Array {
  for (let i = 0; i < inner.length; i++) r[i] = outer[inner[i]];
  return r;
}

function composeBytes(outer: Uint8Array, inner: Uint32Array): Uint8Array {
  const r = new Uint8Array(new SharedArrayBuffer(inner.length));
  for (let i = 0; i < inner.length; i++) r[i] = outer[inner[i]];
  return r;
}

function permuteIds(ids: NodeIds, perm: Uint32Array): NodeIds {
  const n = perm.length;
  if (ids.kind === "integer") {
    // Word by word: reading a BigUint64Array element makes a BigInt.
    const out = new BigUint64Array(new SharedArrayBuffer(8 * n));
    const from = new Uint32Array(ids.ids.buffer, ids.ids.byteOffset, 2 * n);
    const to = new Uint32Array(out.buffer);
    for (let c = 0; c < n; c++) {
      const v = perm[c];
      to[2 * v] = from[2 * c];
      to[2 * v + 1] = from[2 * c + 1];
    }
    return { kind: "integer", ids: out };
  }
  const lens = new Uint32Array(n + 1);
  for (let c = 0; c < n; c++) lens[perm[c] + 1] = ids.offsets[c + 1] - ids.offsets[c];
  for (let i = 0; i < n; i++) lens[i + 1] += lens[i];
  const bytes = new Uint8Array(ids.bytes.length);
  for (let c = 0; c < n; c++) bytes.set(ids.bytes.subarray(ids.offsets[c], ids.offsets[c + 1]), lens[perm[c]]);
  return { kind: "string", bytes, offsets: lens };
}
