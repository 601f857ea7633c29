// The passes of the CSR build, each over one slice of the work so that threads can share a pass: every slice writes
// only memory it owns, and the result is the same bits for any number of slices.
// First the parsed arcs are relabelled in place to final ids (independent lookups, which the CPU overlaps); the
// scatters then follow one dependent load per arc instead of two. Naming: u/v = final ids, x = a value as stored by the
// parser.

export interface PassSegment {
  src: Uint32Array;
  dst: Uint32Array;
  weight: Float64Array | null;
}

/**
 * Relabel pass: x → fmap[x] in place, for both ends of every arc of the slice's segments. A segment with `starts` is
 * also partitioned in place by target bucket: bucket[x] is the bucket of stored target value x, and the arcs
 * of bucket j end up at [starts[j], starts[j + 1]) of the segment. The scatter then reads one bucket at a time and
 * writes into one cache-sized stretch of the in-lists instead of all over them.
 */
export interface PassRelabel {
  segments: Array<{ src: Uint32Array; dst: Uint32Array; fmap: Uint32Array; bucket?: Uint8Array; starts?: Uint32Array }>;
  /** The partition in WebAssembly (workers/assembly/lane-passes.ts), used when every segment shares one fmap. */
  lanes?: WebAssembly.Module;
}

/** Per-thread scratch of the partition, reused across segments and passes. */
let scratch = { src: new Uint32Array(0), dst: new Uint32Array(0), bucket: new Uint8Array(0) };

export function relabelArcs(t: PassRelabel): void {
  const first = t.segments[0];
  const shared = first?.bucket && first.starts && t.segments.every((s) => s.fmap === first.fmap && s.bucket === first.bucket && s.starts);
  if (t.lanes && shared && relabelInWasm(t.lanes, t.segments as Array<Required<PassRelabel["segments"][number]>>)) return;
  for (const { src, dst, fmap, bucket, starts } of t.segments) {
    if (bucket === undefined || starts === undefined) {
      for (let i = 0; i < src.length; i++) {
        src[i] = fmap[src[i]];
        dst[i] = fmap[dst[i]];
      }
      continue;
    }
    const len = src.length;
    if (scratch.src.length < len) {
      const size = Math.max(len, 2 * scratch.src.length);
      scratch = { src: new Uint32Array(size), dst: new Uint32Array(size), bucket: new Uint8Array(size) };
    }
    partition(src, dst, fmap, bucket, starts);
  }
}

type RelabelPartition = (
  src: number, dst: number, k: number, fmap: number, bucket: number, buckets: number, tb: number, counts: number,
  starts: number, outSrc: number, outDst: number,
) => void;

/** This thread's memory for lane-passes.ts, kept across passes (its pages are in memory after the first). */
let laneMemory: WebAssembly.Memory | null = null;

/** Most lane memory a pass may use (a linear memory holds 4 GiB at most); bigger passes run in JS. */
const LANE_MAX_BYTES = 3 * 2 ** 30;

/** This thread's lane memory, grown to `bytes` bytes, or null past LANE_MAX_BYTES (or when it cannot grow). */
function laneBytes(bytes: number): WebAssembly.Memory | null {
  if (bytes > LANE_MAX_BYTES) return null;
  const pages = Math.ceil(bytes / 65_536);
  try {
    laneMemory ??= new WebAssembly.Memory({ initial: pages });
    const have = laneMemory.buffer.byteLength / 65_536;
    if (have < pages) laneMemory.grow(pages - have);
  } catch {
    return null;
  }
  return laneMemory;
}

/**
 * partition() for segments sharing one fmap and bucket table: each copied in, relabelled and grouped, copied out.
 * False (nothing done) when the tables do not fit this thread's lane memory.
 */
function relabelInWasm(module: WebAssembly.Module, segments: Array<Required<PassRelabel["segments"][number]>>): boolean {
  const { fmap, bucket } = segments[0];
  const buckets = segments[0].starts.length - 1;
  const piece = segments.reduce((a, s) => Math.max(a, s.src.length), 0);
  const align = (x: number) => Math.ceil(x / 64) * 64;
  const F = 65_536;
  const B = F + align(4 * fmap.length);
  const S = B + align(bucket.length);
  const D = S + align(4 * piece);
  const OS = D + align(4 * piece);
  const OD = OS + align(4 * piece);
  const TB = OD + align(4 * piece);
  const C = TB + align(piece);
  const ST = C + align(16 * buckets);
  const memory = laneBytes(ST + align(4 * (buckets + 1)));
  if (memory === null) return false;
  const run = new WebAssembly.Instance(module, { env: { memory } }).exports.relabelPartition as RelabelPartition;
  const u32 = new Uint32Array(memory.buffer);
  new Uint32Array(memory.buffer, F, fmap.length).set(fmap);
  new Uint8Array(memory.buffer, B, bucket.length).set(bucket);
  for (const { src, dst, starts } of segments) {
    const k = src.length;
    u32.set(src, S >> 2);
    u32.set(dst, D >> 2);
    run(S, D, k, F, B, buckets, TB, C, ST, OS, OD);
    src.set(u32.subarray(OS >> 2, (OS >> 2) + k));
    dst.set(u32.subarray(OD >> 2, (OD >> 2) + k));
    starts.set(u32.subarray(ST >> 2, (ST >> 2) + buckets + 1));
  }
  return true;
}

/**
 * Relabel one segment and partition it by target bucket. Four interleaved lanes (arc i on lane i mod 4) count and
 * place on their own counters, so consecutive arcs of one bucket do not wait on each other's increment; inside a
 * bucket the arcs sit lane by lane (a fixed order: the scatter sorts each list anyway).
 */
function partition(src: Uint32Array, dst: Uint32Array, fmap: Uint32Array, bucket: Uint8Array, starts: Uint32Array): void {
  const len = src.length;
  const tb = scratch.bucket;
  const buckets = starts.length - 1;
  const c = new Uint32Array(4 * buckets);
  const body = len & ~3;
  for (let i = 0; i < body; i += 4) {
    const x0 = dst[i];
    const x1 = dst[i + 1];
    const x2 = dst[i + 2];
    const x3 = dst[i + 3];
    const b0 = bucket[x0];
    const b1 = bucket[x1];
    const b2 = bucket[x2];
    const b3 = bucket[x3];
    tb[i] = b0;
    tb[i + 1] = b1;
    tb[i + 2] = b2;
    tb[i + 3] = b3;
    c[4 * b0]++;
    c[4 * b1 + 1]++;
    c[4 * b2 + 2]++;
    c[4 * b3 + 3]++;
    src[i] = fmap[src[i]];
    src[i + 1] = fmap[src[i + 1]];
    src[i + 2] = fmap[src[i + 2]];
    src[i + 3] = fmap[src[i + 3]];
    dst[i] = fmap[x0];
    dst[i + 1] = fmap[x1];
    dst[i + 2] = fmap[x2];
    dst[i + 3] = fmap[x3];
  }
  for (let i = body; i < len; i++) {
    const x = dst[i];
    const b = bucket[x];
    tb[i] = b;
    c[4 * b + (i & 3)]++;
    src[i] = fmap[src[i]];
    dst[i] = fmap[x];
  }
  let at = 0;
  for (let j = 0; j < buckets; j++) {
    starts[j] = at;
    for (let lane = 0; lane < 4; lane++) {
      const k = 4 * j + lane;
      const count = c[k];
      c[k] = at;
      at += count;
    }
  }
  starts[buckets] = at;
  const ts = scratch.src;
  const td = scratch.dst;
  for (let i = 0; i < body; i += 4) {
    const p0 = c[4 * tb[i]]++;
    const p1 = c[4 * tb[i + 1] + 1]++;
    const p2 = c[4 * tb[i + 2] + 2]++;
    const p3 = c[4 * tb[i + 3] + 3]++;
    ts[p0] = src[i];
    td[p0] = dst[i];
    ts[p1] = src[i + 1];
    td[p1] = dst[i + 1];
    ts[p2] = src[i + 2];
    td[p2] = dst[i + 2];
    ts[p3] = src[i + 3];
    td[p3] = dst[i + 3];
  }
  for (let i = body; i < len; i++) {
    const p = c[4 * tb[i] + (i & 3)]++;
    ts[p] = src[i];
    td[p] = dst[i];
  }
  src.set(ts.subarray(0, len));
  dst.set(td.subarray(0, len));
}

/**
 * Pass A over the arcs whose source is in [uLo, uHi): arcs grouped by source into bySrcDst/bySrcW at cursor[u]
 * (cursor advances), in file order inside each group. Undirected lines give both arcs; each goes to its own source's
 * owner.
 */
export interface PassA {
  segments: PassSegment[];
  uLo: number;
  uHi: number;
  dropSelf: boolean;
  both: boolean;
  cursor: Uint32Array;
  bySrcDst: Uint32Array;
  bySrcW: Float64Array | null;
}

export function scatterBySource(t: PassA): void {
  const { uLo, uHi, dropSelf, both, cursor, bySrcDst, bySrcW } = t;
  for (const { src, dst, weight } of t.segments) {
    for (let i = 0; i < src.length; i++) {
      const u = src[i];
      const v = dst[i];
      const ownU = u >= uLo && u < uHi;
      let ownV = both && v >= uLo && v < uHi;
      if (!ownU && !ownV) continue;
      if (u === v) {
        if (dropSelf) continue;
        ownV = false;
      }
      const w = weight !== null ? weight[i] : 1;
      if (ownU) {
        const p = cursor[u]++;
        bySrcDst[p] = v;
        if (bySrcW !== null) bySrcW[p] = w;
      }
      if (ownV) {
        const p = cursor[v]++;
        bySrcDst[p] = u;
        if (bySrcW !== null) bySrcW[p] = w;
      }
    }
  }
}

/**
 * Pass B for the in-lists of targets [vLo, vHi): walking sources in ascending order fills each list already sorted;
 * an arc equal to the one just placed in its list is a duplicate and (when merging) adds its weight there.
 * fillLast[2v] = next free slot of v's list, fillLast[2v+1] = last source placed (NO_SOURCE at first).
 * Also W_u = Σ weights of u's arcs (file order) for u in [uLo, uHi).
 */
export interface PassB {
  n: number;
  vLo: number;
  vHi: number;
  uLo: number;
  uHi: number;
  merge: boolean;
  outStart: Uint32Array;
  bySrcDst: Uint32Array;
  bySrcW: Float64Array | null;
  fillLast: Uint32Array;
  sources: Uint32Array;
  weights: Float64Array | null;
  outWeight: Float64Array;
}

export const NO_SOURCE = 0xffffffff;

/** Returns the number of arcs merged into an earlier identical arc. */
export function fillInLists(t: PassB): number {
  const { n, vLo, vHi, uLo, uHi, merge, outStart, bySrcDst, bySrcW, fillLast, sources, weights, outWeight } = t;
  let merged = 0;
  for (let u = 0; u < n; u++) {
    const end = outStart[u + 1];
    if (u >= uLo && u < uHi) {
      let sum = 0;
      for (let p = outStart[u]; p < end; p++) sum += bySrcW !== null ? bySrcW[p] : 1;
      outWeight[u] = sum;
    }
    for (let p = outStart[u]; p < end; p++) {
      const v = bySrcDst[p];
      if (v < vLo || v >= vHi) continue;
      const w = bySrcW !== null ? bySrcW[p] : 1;
      const at = fillLast[2 * v];
      if (merge && fillLast[2 * v + 1] === u) {
        (weights as Float64Array)[at - 1] += w;
        merged++;
        continue;
      }
      sources[at] = u;
      if (weights !== null) weights[at] = w;
      fillLast[2 * v] = at + 1;
      fillLast[2 * v + 1] = u;
    }
  }
  return merged;
}

/**
 * Unweighted graphs skip pass A: arcs go straight into their in-lists (fill[v] advances), then each list is sorted by
 * source. Equal sources are interchangeable without weights, so the result equals the two-pass build's.
 * The slice does the target ranges [cuts[j], cuts[j + 1]) for j in [first, last), one after another. A segment with
 * `starts` (partitioned by the relabel pass on the same cuts) gives each range's arcs at [starts[j], starts[j + 1]);
 * one without is read whole, keeping the arcs of the range.
 */
export interface PassD {
  segments: Array<PassSegment & { starts?: Uint32Array }>;
  cuts: Uint32Array;
  first: number;
  last: number;
  dropSelf: boolean;
  both: boolean;
  inOffsets: Uint32Array;
  fill: Uint32Array;
  sources: Uint32Array;
  /** Out, when set (duplicates merge): in-degree of each target of the slice counting repeated sources once. */
  inDistinct: Uint32Array | null;
  /** Out, this slice's own, when set: dupOut[u] += 1 for every repeat of source u in the slice's lists. */
  dupOut: Uint32Array | null;
  /** Order partitioned buckets in WebAssembly (workers/assembly/order-lists.ts) instead of JS. */
  lists?: ListsWasm;
}

/**
 * The WebAssembly bucket orderer and where it works: `memory` holds sources, inOffsets, fill and (when set)
 * inDistinct and dupOut, and this slice's own scratch of `scratchArcs` arcs at byte offset `scratch`
 * (listsScratchBytes long).
 */
export interface ListsWasm {
  module: WebAssembly.Module;
  memory: WebAssembly.Memory;
  scratch: number;
  scratchArcs: number;
}

/** Bytes of one slice's scratch for buckets of at most `arcs` arcs: two pairs of arc arrays and the digit counts. */
export function listsScratchBytes(arcs: number): number {
  return 16 * arcs + 4 * (COUNT_SLOTS + 16);
}

const COUNT_SLOTS = (1 << 11) + 1;

type OrderBucket = (
  us: number, vs: number, us2: number, vs2: number, k: number, bits: number, counts: number,
  fill: number, inOffsets: number, sources: number, inDistinct: number, dupOut: number,
) => number;

const INSERTION_SORT_MAX = 48;

/** Returns the number of arcs in the slice's lists equal to the arc before them (duplicates). */
export function scatterByTarget(t: PassD): number {
  let dups = 0;
  const partitioned = !t.both && t.segments.every((seg) => seg.starts !== undefined);
  const order = partitioned && t.lists ? wasmOrder(t, t.lists) : null;
  for (let j = t.first; j < t.last; j++) {
    const vLo = t.cuts[j];
    const vHi = t.cuts[j + 1];
    if (partitioned) {
      dups += order ? order(j) : placeSorted(t, j);
      checkFilled(t, vLo, vHi);
      continue;
    }
    for (const seg of t.segments) scatterRange(t, seg, 0, seg.src.length, vLo, vHi);
    checkFilled(t, vLo, vHi);
    dups += sortLists(t, vLo, vHi);
  }
  // The JS scratch goes with the pass (this may be a long-lived thread).
  pairs = NO_PAIRS;
  return dups;
}

const NO_PAIRS = { u: new Uint32Array(0), v: new Uint32Array(0), u2: new Uint32Array(0), v2: new Uint32Array(0) };
let pairs = NO_PAIRS;

/** Bucket j's arcs into us/vs (self-loops dropped as the policy says); returns their number. */
function gather(t: PassD, j: number, us: Uint32Array, vs: Uint32Array): number {
  const dropSelf = t.dropSelf;
  let k = 0;
  for (const seg of t.segments) {
    const starts = seg.starts as Uint32Array;
    const { src, dst } = seg;
    const hi = starts[j + 1];
    for (let i = starts[j]; i < hi; i++) {
      const u = src[i];
      const v = dst[i];
      if (u === v && dropSelf) continue;
      us[k] = u;
      vs[k] = v;
      k++;
    }
  }
  return k;
}

function bucketArcs(t: PassD, j: number): number {
  let total = 0;
  for (const seg of t.segments) total += (seg.starts as Uint32Array)[j + 1] - (seg.starts as Uint32Array)[j];
  return total;
}

/** Bits of the largest source id: the radix sorts' key width. */
function sourceBits(t: PassD): number {
  return Math.max(1, 32 - Math.clz32(Math.max(1, t.inOffsets.length - 2)));
}

/**
 * The in-lists of bucket j without a comparison sort: gather the bucket's arcs (a few hundred KB), order them by
 * source with a least-significant-digit radix sort, then place them in that order, so every list fills already
 * sorted and a repeat lands right after its equal. Returns the repeats.
 */
function placeSorted(t: PassD, j: number): number {
  const { fill, sources, inOffsets, inDistinct, dupOut } = t;
  const total = bucketArcs(t, j);
  if (pairs.u.length < total) {
    const size = Math.max(total, Math.ceil(1.25 * pairs.u.length));
    pairs = { u: new Uint32Array(size), v: new Uint32Array(size), u2: new Uint32Array(size), v2: new Uint32Array(size) };
  }
  let { u: us, v: vs, u2: us2, v2: vs2 } = pairs;
  const k = gather(t, j, us, vs);
  // Digits of at most 11 bits over the bits of the largest source id.
  const bits = sourceBits(t);
  const passes = Math.ceil(bits / 11);
  const width = Math.ceil(bits / passes);
  const mask = (1 << width) - 1;
  const count = new Uint32Array(mask + 2);
  for (let p = 0, shift = 0; p < passes; p++, shift += width) {
    count.fill(0);
    for (let i = 0; i < k; i++) count[((us[i] >>> shift) & mask) + 1]++;
    if (k > 0 && count[((us[0] >>> shift) & mask) + 1] === k) continue;
    for (let d = 0; d <= mask; d++) count[d + 1] += count[d];
    for (let i = 0; i < k; i++) {
      const u = us[i];
      const at = count[(u >>> shift) & mask]++;
      us2[at] = u;
      vs2[at] = vs[i];
    }
    [us, us2] = [us2, us];
    [vs, vs2] = [vs2, vs];
  }
  let dups = 0;
  for (let i = 0; i < k; i++) {
    const u = us[i];
    const v = vs[i];
    const at = fill[v];
    if (at > inOffsets[v] && sources[at - 1] === u) {
      dups++;
      if (dupOut !== null) dupOut[u]++;
    } else if (inDistinct !== null) inDistinct[v]++;
    sources[at] = u;
    fill[v] = at + 1;
  }
  return dups;
}

/** placeSorted in WebAssembly: the gather here, into the slice's scratch; the ordering in the module. */
function wasmOrder(t: PassD, lists: ListsWasm): (j: number) => number {
  const { memory, scratch, scratchArcs: cap } = lists;
  const order = new WebAssembly.Instance(lists.module, { env: { memory } }).exports.orderBucket as OrderBucket;
  const buffer = memory.buffer as unknown as SharedArrayBuffer;
  const at = (a: Uint32Array | null) => {
    if (a === null) return 0;
    if (a.buffer !== buffer) throw new Error("build: the WebAssembly bucket order needs its arrays in its memory");
    return a.byteOffset;
  };
  const us = new Uint32Array(buffer, scratch, cap);
  const vs = new Uint32Array(buffer, scratch + 4 * cap, cap);
  const bits = sourceBits(t);
  const fixed = [at(t.fill), at(t.inOffsets), at(t.sources), at(t.inDistinct), at(t.dupOut)] as const;
  return (j) => {
    // At most the bucket's in-arcs (a bug past them would be dropped by the views and caught by checkFilled).
    const k = gather(t, j, us, vs);
    return order(scratch, scratch + 4 * cap, scratch + 8 * cap, scratch + 12 * cap, k, bits, scratch + 16 * cap, ...fixed);
  };
}

function checkFilled(t: PassD, vLo: number, vHi: number): void {
  const { fill, inOffsets } = t;
  for (let v = vLo; v < vHi; v++) {
    if (fill[v] !== inOffsets[v + 1]) throw new Error(`build: in-list of node ${v} got ${fill[v] - inOffsets[v]} arcs, expected ${inOffsets[v + 1] - inOffsets[v]}`);
  }
}

function scatterRange(t: PassD, seg: PassSegment, lo: number, hi: number, vLo: number, vHi: number): void {
  const { dropSelf, fill, sources } = t;
  const { src, dst } = seg;
  if (!t.both) {
    for (let i = lo; i < hi; i++) {
      const v = dst[i];
      if (v < vLo || v >= vHi) continue;
      const u = src[i];
      if (u === v && dropSelf) continue;
      sources[fill[v]++] = u;
    }
    return;
  }
  for (let i = lo; i < hi; i++) {
    const u = src[i];
    const v = dst[i];
    const ownV = v >= vLo && v < vHi;
    let ownU = u >= vLo && u < vHi;
    if (!ownU && !ownV) continue;
    if (u === v) {
      if (dropSelf) continue;
      ownU = false;
    }
    if (ownV) sources[fill[v]++] = u;
    if (ownU) sources[fill[u]++] = v;
  }
}

/** Sort the in-lists of [vLo, vHi) by source; counts repeats (per target and per source when asked). */
function sortLists(t: PassD, vLo: number, vHi: number): number {
  const { inOffsets, inDistinct, dupOut, sources } = t;
  let dups = 0;
  for (let v = vLo; v < vHi; v++) {
    const a = inOffsets[v];
    const b = inOffsets[v + 1];
    const before = dups;
    if (b - a > INSERTION_SORT_MAX) {
      sources.subarray(a, b).sort();
      for (let i = a + 1; i < b; i++) {
        if (sources[i] === sources[i - 1]) {
          dups++;
          if (dupOut !== null) dupOut[sources[i]]++;
        }
      }
    } else {
      for (let i = a + 1; i < b; i++) {
        const key = sources[i];
        let j = i - 1;
        while (j >= a && sources[j] > key) {
          sources[j + 1] = sources[j];
          j--;
        }
        sources[j + 1] = key;
        if (j >= a && sources[j] === key) {
          dups++;
          if (dupOut !== null) dupOut[key]++;
        }
      }
    }
    if (inDistinct !== null) inDistinct[v] = b - a - (dups - before);
  }
  return dups;
}

/**
 * Touch pass: one write per 4 KiB page of [from, to) of a buffer nobody else writes yet, to fault the pages in, until
 * stop[0] is set (then whoever writes there first faults in the rest). The range is taken as `parts` equal parts
 * touched a stretch of each in turn, so that when the threads of a later pass write one part each, the pages left to
 * them are shared out evenly. Returns the bytes touched.
 */
export interface PassTouch {
  buffer: SharedArrayBuffer;
  from: number;
  to: number;
  parts: number;
  stop: Int32Array;
  /**
   * Others may write [from, to) meanwhile: each page then gets an atomic compare-exchange of 0 with 0 (it stores only
   * over a 0, and a page that holds data is in memory already). `from` is then a multiple of 4.
   */
  atomic?: boolean;
}

const TOUCH_STRETCH = 64 << 12;

export function touchPages(t: PassTouch): number {
  const bytes = new Uint8Array(t.buffer, t.from, t.to - t.from);
  const part = Math.ceil(bytes.length / Math.max(1, t.parts) / TOUCH_STRETCH) * TOUCH_STRETCH;
  const words = t.atomic ? new Int32Array(t.buffer) : null;
  let done = 0;
  for (let at = 0; at < part && Atomics.load(t.stop, 0) === 0; at += TOUCH_STRETCH) {
    for (let p = at; p < bytes.length; p += part) {
      const end = Math.min(bytes.length, p + TOUCH_STRETCH);
      if (words) for (let i = p; i < end; i += 4096) Atomics.compareExchange(words, (t.from + i) >> 2, 0, 0);
      else for (let i = p; i < end; i += 4096) bytes[i] = 0;
      done += end - p;
    }
  }
  return done;
}

/** Counting pass of the direct numbering: lines per stored value as source, as target, and as self-loop. */
export interface PassCount {
  edges: Array<{ src: Uint32Array; dst: Uint32Array }>;
  outRaw: Uint32Array;
  inRaw: Uint32Array;
  /** Present when the file has self-loops. */
  selfRaw: Uint32Array | null;
  /** Count in WebAssembly (workers/assembly/lane-passes.ts), in this thread's lane memory. */
  lanes?: WebAssembly.Module;
}

type CountValues = (src: number, dst: number, k: number, outRaw: number, inRaw: number, selfRaw: number) => void;

export function countValues(t: PassCount): void {
  if (t.lanes && countInWasm(t.lanes, t)) return;
  const { outRaw, inRaw, selfRaw } = t;
  for (const { src, dst } of t.edges) {
    for (let i = 0; i < src.length; i++) {
      const x = src[i];
      const y = dst[i];
      outRaw[x]++;
      inRaw[y]++;
      if (x === y && selfRaw !== null) selfRaw[x]++;
    }
  }
}

/**
 * countValues with the tables in this thread's lane memory (whose pages the partition then reuses). False (nothing
 * done) when the tables do not fit it.
 */
function countInWasm(module: WebAssembly.Module, t: PassCount): boolean {
  const values = t.outRaw.length;
  const tableBytes = Math.ceil((4 * values) / 64) * 64;
  const OUT = 65_536;
  const IN = OUT + tableBytes;
  const SELF = IN + tableBytes;
  const SRC = SELF + (t.selfRaw ? tableBytes : 0);
  const DST = SRC + 4 * COUNT_PIECE;
  const memory = laneBytes(DST + 4 * COUNT_PIECE);
  if (memory === null) return false;
  const count = new WebAssembly.Instance(module, { env: { memory } }).exports.countValues as CountValues;
  const u32 = new Uint32Array(memory.buffer);
  u32.fill(0, OUT >> 2, SRC >> 2);
  for (const { src, dst } of t.edges) {
    for (let a = 0; a < src.length; a += COUNT_PIECE) {
      const b = Math.min(src.length, a + COUNT_PIECE);
      u32.set(src.subarray(a, b), SRC >> 2);
      u32.set(dst.subarray(a, b), DST >> 2);
      count(SRC, DST, b - a, OUT, IN, t.selfRaw ? SELF : 0);
    }
  }
  t.outRaw.set(u32.subarray(OUT >> 2, (OUT >> 2) + values));
  t.inRaw.set(u32.subarray(IN >> 2, (IN >> 2) + values));
  t.selfRaw?.set(u32.subarray(SELF >> 2, (SELF >> 2) + values));
  return true;
}

const COUNT_PIECE = 1 << 16;

/** Cut 0..len into `parts` ranges of about equal total weight (prefix[i] = total weight before i). */
export function balancedCuts(prefixAt: (i: number) => number, len: number, parts: number): number[] {
  const total = prefixAt(len);
  const cuts = [0];
  for (let k = 1; k < parts; k++) {
    const target = (total * k) / parts;
    let lo = cuts[k - 1];
    let hi = len;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (prefixAt(mid) < target) lo = mid + 1;
      else hi = mid;
    }
    cuts.push(lo);
  }
  cuts.push(len);
  return cuts;
}
