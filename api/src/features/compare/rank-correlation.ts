// Rank agreement between two score vectors over the same items, and between two ranked lists.
import { rankOrder } from "../../../../workers/src/output/rank-order";

/** Number of pairs among `t` tied items: t(t−1)/2. */
function pairs(t: number): number {
  return (t * (t - 1)) / 2;
}

/** Sum of t(t−1)/2 over runs of equal values in an already sorted sequence. */
function tiedPairs(values: Float64Array): number {
  let total = 0;
  let run = 1;
  for (let i = 1; i <= values.length; i++) {
    if (i < values.length && values[i] === values[i - 1]) run++;
    else {
      total += pairs(run);
      run = 1;
    }
  }
  return total;
}

/** Sorts `a` ascending in place (stable merge sort) and returns the number of pairs i < j with a[i] > a[j]. */
function sortCountingInversions(a: Float64Array): number {
  const n = a.length;
  let src: Float64Array = a;
  let dst: Float64Array = new Float64Array(n);
  let inversions = 0;
  for (let width = 1; width < n; width *= 2) {
    for (let lo = 0; lo < n; lo += 2 * width) {
      const mid = Math.min(lo + width, n);
      const hi = Math.min(lo + 2 * width, n);
      let i = lo;
      let j = mid;
      let k = lo;
      while (i < mid && j < hi) {
        if (src[j] < src[i]) {
          // every element still waiting on the left is larger than src[j]
          inversions += mid - i;
          dst[k++] = src[j++];
        } else dst[k++] = src[i++];
      }
      while (i < mid) dst[k++] = src[i++];
      while (j < hi) dst[k++] = src[j++];
    }
    [src, dst] = [dst, src];
  }
  if (src !== a) a.set(src);
  return inversions;
}

/**
 * Kendall's tau-b in O(n log n) (Knight 1966, with ties):
 * τ_b = (n₀ − n₁ − n₂ + n₃ − 2·swaps) / √((n₀ − n₁)(n₀ − n₂)), n₀ = n(n−1)/2, n₁/n₂ = pairs tied in x/y,
 * n₃ = pairs tied in both, swaps = discordant pairs counted by merge sort of y ordered by (x, y).
 * Null when n < 2 or either side is constant.
 */
export function kendallTauB(x: Float64Array, y: Float64Array): number | null {
  const n = x.length;
  if (y.length !== n) throw new RangeError(`y must have ${n} entries. Value: ${y.length}`);
  if (n < 2) return null;
  // Items by (x, y) ascending from two radix passes: by y, then stably by x (rankOrder breaks ties by position).
  const byY = rankOrder(y);
  const xByY = new Float64Array(n);
  for (let p = 0; p < n; p++) xByY[p] = x[byY[p]];
  const byXY = rankOrder(xByY);
  const xs = new Float64Array(n);
  const ys = new Float64Array(n);
  for (let p = 0; p < n; p++) {
    const i = byY[byXY[n - 1 - p]];
    xs[p] = x[i];
    ys[p] = y[i];
  }
  const n0 = pairs(n);
  const n1 = tiedPairs(xs);
  let n3 = 0;
  let run = 1;
  for (let i = 1; i <= n; i++) {
    if (i < n && xs[i] === xs[i - 1] && ys[i] === ys[i - 1]) run++;
    else {
      n3 += pairs(run);
      run = 1;
    }
  }
  const swaps = sortCountingInversions(ys);
  const n2 = tiedPairs(ys);
  const denominator = Math.sqrt((n0 - n1) * (n0 - n2));
  if (denominator === 0) return null;
  return (n0 - n1 - n2 + n3 - 2 * swaps) / denominator;
}

function isNonIncreasing(v: Float64Array): boolean {
  for (let i = 1; i < v.length; i++) if (!(v[i] <= v[i - 1])) return false;
  return true;
}

function identity(n: number): Uint32Array {
  const out = new Uint32Array(n);
  for (let i = 0; i < n; i++) out[i] = i;
  return out;
}

/** Fractional ranks 1..n of `v` ascending; tied values share the mean of their positions. */
export function averageRanks(v: Float64Array): Float64Array {
  const n = v.length;
  // Descending order (ties by index) read backwards: position p of `desc` is ascending position n − 1 − p.
  // Scores listed in rank order are already descending.
  const desc = isNonIncreasing(v) ? identity(n) : rankOrder(v);
  const ranks = new Float64Array(n);
  let p = 0;
  while (p < n) {
    let q = p;
    while (q + 1 < n && v[desc[q + 1]] === v[desc[p]]) q++;
    // ascending positions n − 1 − q .. n − 1 − p
    const rank = (n - 1 - q + (n - 1 - p)) / 2 + 1;
    for (let k = p; k <= q; k++) ranks[desc[k]] = rank;
    p = q + 1;
  }
  return ranks;
}

/** Spearman's ρ = Pearson correlation of the average ranks of x and y. Null when n < 2 or a side is constant. */
export function spearmanRho(x: Float64Array, y: Float64Array): number | null {
  const n = x.length;
  if (y.length !== n) throw new RangeError(`y must have ${n} entries. Value: ${y.length}`);
  if (n < 2) return null;
  const rx = averageRanks(x);
  const ry = averageRanks(y);
  const mean = (n + 1) / 2;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    const dx = rx[i] - mean;
    const dy = ry[i] - mean;
    sxy += dx * dy;
    sxx += dx * dx;
    syy += dy * dy;
  }
  if (sxx === 0 || syy === 0) return null;
  return sxy / Math.sqrt(sxx * syy);
}

/**
 * Extrapolated rank-biased overlap of two rankings cut at the same depth k (Webber, Moffat & Zobel 2010, eq. 32
 * with s = l = k): RBO_ext = (X_k/k)·p^k + (1−p)/p · Σ_{d=1..k} (X_d/d)·p^d, X_d = |S_{1:d} ∩ T_{1:d}|.
 * Items are assumed distinct within each list. 1 for identical prefixes, 0 for disjoint ones.
 */
export function rankBiasedOverlap(s: readonly string[], t: readonly string[], p: number): number {
  const k = Math.min(s.length, t.length);
  if (!(p > 0 && p < 1)) throw new RangeError(`p must be in (0, 1). Value: ${p}`);
  if (k === 0) return 0;
  const seenS = new Set<string>();
  const seenT = new Set<string>();
  let overlap = 0;
  let sum = 0;
  let weight = 1;
  for (let d = 1; d <= k; d++) {
    const a = s[d - 1];
    const b = t[d - 1];
    if (a === b) overlap++;
    else {
      if (seenT.has(a)) overlap++;
      if (seenS.has(b)) overlap++;
    }
    seenS.add(a);
    seenT.add(b);
    weight *= p;
    sum += (overlap / d) * weight;
  }
  return (overlap / k) * weight + ((1 - p) / p) * sum;
}
