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

/** Relabel pass: x → fmap[x] in place, for both ends of every arc of the slice's segments. */
export interface PassRelabel {
  segments: Array<{ src: Uint32Array; dst: Uint32Array; fmap: Uint32Array }>;
}

export function relabelArcs(t: PassRelabel): void {
  for (const { src, dst, fmap } of t.segments) {
    for (let i = 0; i < src.length; i++) {
      src[i] = fmap[src[i]];
      dst[i] = fmap[dst[i]];
    }
  }
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
 * Unweighted graphs skip pass A: arcs whose target is in [vLo, vHi) go straight into their in-lists (fill[v]
 * advances), then each of those lists is sorted by source. Equal sources are interchangeable without weights, so the
 * result equals the two-pass build's.
 */
export interface PassD {
  segments: PassSegment[];
  vLo: number;
  vHi: number;
  dropSelf: boolean;
  both: boolean;
  inOffsets: Uint32Array;
  fill: Uint32Array;
  sources: Uint32Array;
  /** Out, when set (duplicates merge): in-degree of each target of the slice counting repeated sources once. */
  inDistinct: Uint32Array | null;
  /** Out, this slice's own, when set: dupOut[u] += 1 for every repeat of source u in the slice's lists. */
  dupOut: Uint32Array | null;
}

const INSERTION_SORT_MAX = 48;

/** Returns the number of arcs in the slice's lists equal to the arc before them (duplicates). */
export function scatterByTarget(t: PassD): number {
  const { vLo, vHi, dropSelf, both, fill, sources } = t;
  for (const { src, dst } of t.segments) {
    if (!both) {
      for (let i = 0; i < src.length; i++) {
        const v = dst[i];
        if (v < vLo || v >= vHi) continue;
        const u = src[i];
        if (u === v && dropSelf) continue;
        sources[fill[v]++] = u;
      }
      continue;
    }
    for (let i = 0; i < src.length; i++) {
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
  const { inOffsets, inDistinct, dupOut } = t;
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

/** Counting pass of the direct numbering: lines per stored value as source, as target, and as self-loop. */
export interface PassCount {
  edges: Array<{ src: Uint32Array; dst: Uint32Array }>;
  outRaw: Uint32Array;
  inRaw: Uint32Array;
  /** Present when the file has self-loops. */
  selfRaw: Uint32Array | null;
}

export function countValues(t: PassCount): void {
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
