// The two scatter passes of the CSR build, each over one slice of the work so that threads can share a pass: every
// slice reads all arcs but writes only memory it owns, and the result is the same bits for any number of slices.
// Naming: c = canonical node id (original-id order), u/v = final ids, x = a value as stored by the parser.

export interface PassSegment {
  src: Uint32Array;
  dst: Uint32Array;
  weight: Float64Array | null;
  /** x → c */
  map: Uint32Array;
  /** x → final id */
  fmap: Uint32Array;
  /** When set, c = map[x] is increasing in x and the slice [cLo, cHi) is exactly x in [xLo, xHi). */
  xLo: number | null;
  xHi: number | null;
}

/**
 * Pass A over the arcs whose source has canonical id in [cLo, cHi): arcs grouped by final source into
 * bySrcDst/bySrcW at cursor[u] (cursor advances), in file order inside each group. Undirected lines give both arcs;
 * each goes to its own source's owner.
 */
export interface PassA {
  segments: PassSegment[];
  cLo: number;
  cHi: number;
  dropSelf: boolean;
  both: boolean;
  cursor: Uint32Array;
  bySrcDst: Uint32Array;
  bySrcW: Float64Array | null;
}

export function scatterBySource(t: PassA): void {
  for (const seg of t.segments) scatterSegment(t, seg);
}

function scatterSegment(t: PassA, seg: PassSegment): void {
  const { src, dst, weight, map, fmap } = seg;
  const { cLo, cHi, dropSelf, both, cursor, bySrcDst, bySrcW } = t;
  const direct = seg.xLo !== null && seg.xHi !== null;
  const xLo = seg.xLo ?? 0;
  const xHi = seg.xHi ?? 0;
  for (let i = 0; i < src.length; i++) {
    const x = src[i];
    const y = dst[i];
    let ownX: boolean;
    let ownY: boolean;
    if (direct) {
      ownX = x >= xLo && x < xHi;
      ownY = both && y >= xLo && y < xHi;
    } else {
      const cx = map[x];
      ownX = cx >= cLo && cx < cHi;
      const cy = both ? map[y] : -1;
      ownY = cy >= cLo && cy < cHi;
    }
    if (!ownX && !ownY) continue;
    if (x === y) {
      if (dropSelf) continue;
      ownY = false;
    }
    const u = fmap[x];
    const v = fmap[y];
    const w = weight !== null ? weight[i] : 1;
    if (ownX) {
      const p = cursor[u]++;
      bySrcDst[p] = v;
      if (bySrcW !== null) bySrcW[p] = w;
    }
    if (ownY) {
      const p = cursor[v]++;
      bySrcDst[p] = u;
      if (bySrcW !== null) bySrcW[p] = w;
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
 * Unweighted graphs skip pass A: arcs whose target has canonical id in [cLo, cHi) go straight into their in-lists
 * (fill[v] advances), then each of those lists is sorted by source. Equal sources are interchangeable without
 * weights, so the result equals the two-pass build's.
 */
export interface PassD {
  segments: PassSegment[];
  cLo: number;
  cHi: number;
  dropSelf: boolean;
  both: boolean;
  /** c → final id */
  perm: Uint32Array;
  inOffsets: Uint32Array;
  fill: Uint32Array;
  sources: Uint32Array;
}

const INSERTION_SORT_MAX = 48;

/** Returns the number of arcs in the slice's lists equal to the arc before them (duplicates). */
export function scatterByTarget(t: PassD): number {
  const { cLo, cHi, dropSelf, both, fill, sources } = t;
  for (const seg of t.segments) {
    const { src, dst, map, fmap } = seg;
    const direct = seg.xLo !== null && seg.xHi !== null;
    const xLo = seg.xLo ?? 0;
    const xHi = seg.xHi ?? 0;
    for (let i = 0; i < src.length; i++) {
      const x = src[i];
      const y = dst[i];
      let ownY: boolean;
      let ownX: boolean;
      if (direct) {
        ownY = y >= xLo && y < xHi;
        ownX = both && x >= xLo && x < xHi;
      } else {
        const cy = map[y];
        ownY = cy >= cLo && cy < cHi;
        const cx = both ? map[x] : -1;
        ownX = cx >= cLo && cx < cHi;
      }
      if (!ownX && !ownY) continue;
      if (x === y) {
        if (dropSelf) continue;
        ownX = false;
      }
      if (ownY) sources[fill[fmap[y]]++] = fmap[x];
      if (ownX) sources[fill[fmap[x]]++] = fmap[y];
    }
  }
  const { perm, inOffsets } = t;
  let dups = 0;
  for (let c = cLo; c < cHi; c++) {
    const v = perm[c];
    const a = inOffsets[v];
    const b = inOffsets[v + 1];
    if (b - a > INSERTION_SORT_MAX) {
      sources.subarray(a, b).sort();
      for (let i = a + 1; i < b; i++) if (sources[i] === sources[i - 1]) dups++;
    } else {
      for (let i = a + 1; i < b; i++) {
        const key = sources[i];
        let j = i - 1;
        while (j >= a && sources[j] > key) {
          sources[j + 1] = sources[j];
          j--;
        }
        sources[j + 1] = key;
        if (j >= a && sources[j] === key) dups++;
      }
    }
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
