// Rank order of a score vector: score descending, ties by ascending dense id.

/** Digits of 11, 11 and 10 bits per 32-bit word: at most 2048 counters, so each pass's scatter stays in cache. */
const DIGITS: ReadonlyArray<{ word: 0 | 1; shift: number; mask: number }> = [
  { word: 0, shift: 0, mask: 0x7ff },
  { word: 0, shift: 11, mask: 0x7ff },
  { word: 0, shift: 22, mask: 0x3ff },
  { word: 1, shift: 0, mask: 0x7ff },
  { word: 1, shift: 11, mask: 0x7ff },
  { word: 1, shift: 22, mask: 0x3ff },
];
const SLOTS = 2048;

/**
 * order[i] = the dense id at rank i + 1. LSD radix sort on the float64 bits mapped to a descending unsigned key
 * (−0 counts as +0; NaN order is unspecified), stable from ascending ids so ties keep ascending id. O(n), at most 6
 * passes. The order lives in shared memory (worker threads format score files from it).
 * @example rankOrder(Float64Array.of(0.2, 0.5, 0.2)) // [1, 0, 2]
 */
export function rankOrder(scores: Float64Array): Uint32Array {
  const n = scores.length;
  const hi = new Uint32Array(n);
  const lo = new Uint32Array(n);
  descendingKeys(scores, hi, lo);
  return radixOrder64(hi, lo);
}

/**
 * rankOrder in WebAssembly (workers/assembly/order-lists.ts), over a shared memory out of which `alloc` carves its
 * arrays (e.g. a graph heap's run space between runs); the order it returns is one of them. Same order, bit for bit.
 */
export function rankOrderIn(memory: WebAssembly.Memory, module: WebAssembly.Module, scores: Float64Array, alloc: (length: number) => Uint32Array): Uint32Array {
  const n = scores.length;
  const [hi, lo, idx, hi2, lo2, idx2] = Array.from({ length: 6 }, () => alloc(n));
  const counts = alloc(DIGITS.length * SLOTS);
  for (const a of [hi, lo, idx, hi2, lo2, idx2, counts]) {
    if (a.buffer !== memory.buffer) throw new Error("rankOrderIn: every array must live in the given memory");
  }
  descendingKeys(scores, hi, lo);
  const order = new WebAssembly.Instance(module, { env: { memory } }).exports.radixOrder64 as (...offsets: number[]) => number;
  const at = order(hi.byteOffset, lo.byteOffset, idx.byteOffset, hi2.byteOffset, lo2.byteOffset, idx2.byteOffset, n, counts.byteOffset);
  return at === idx.byteOffset ? idx : idx2;
}

/** Bytes rankOrderIn carves for n scores (seven arrays, each aligned to 64 bytes). */
export function rankOrderBytes(n: number): number {
  return 6 * (4 * n + 64) + 4 * DIGITS.length * SLOTS + 64;
}

/** The descending sort key of each score as two words (see rankOrder). */
function descendingKeys(scores: Float64Array, hi: Uint32Array, lo: Uint32Array): void {
  const n = scores.length;
  const words = new Uint32Array(scores.buffer, scores.byteOffset, n * 2);
  for (let i = 0; i < n; i++) {
    let h = words[2 * i + 1];
    const l = words[2 * i];
    if (h === 0x80000000 && l === 0) h = 0;
    // Descending key = complement of the ascending float key: negatives keep their bits, positives flip all but sign.
    if (h & 0x80000000) {
      hi[i] = h;
      lo[i] = l;
    } else {
      hi[i] = (h ^ 0x7fffffff) >>> 0;
      lo[i] = ~l >>> 0;
    }
  }
}

/**
 * order[s] = index of the s-th smallest 64-bit key (hi[i], lo[i]), ties by ascending index: stable LSD radix sort
 * over six digits of at most 11 bits, O(n). Consumes hi and lo (they are reordered in place of scratch).
 * @example radixOrder64(Uint32Array.of(0, 0), Uint32Array.of(5, 2)) // [1, 0]
 */
export function radixOrder64(hiKeys: Uint32Array, loKeys: Uint32Array): Uint32Array {
  const n = hiKeys.length;
  let hi: Uint32Array = hiKeys;
  let lo: Uint32Array = loKeys;
  // Shared memory: the order is handed to worker threads that format score files.
  let idx: Uint32Array = new Uint32Array(new SharedArrayBuffer(4 * n));
  for (let i = 0; i < n; i++) idx[i] = i;
  // Every digit's histogram in one read; a digit all keys share needs no pass.
  const counts = new Uint32Array(DIGITS.length * SLOTS);
  for (let i = 0; i < n; i++) {
    const l = lo[i];
    const h = hi[i];
    counts[l & 0x7ff]++;
    counts[SLOTS + ((l >>> 11) & 0x7ff)]++;
    counts[2 * SLOTS + (l >>> 22)]++;
    counts[3 * SLOTS + (h & 0x7ff)]++;
    counts[4 * SLOTS + ((h >>> 11) & 0x7ff)]++;
    counts[5 * SLOTS + (h >>> 22)]++;
  }
  let hi2: Uint32Array | null = null;
  let lo2: Uint32Array | null = null;
  let idx2: Uint32Array | null = null;
  for (let d = 0; d < DIGITS.length; d++) {
    const { word, shift, mask } = DIGITS[d];
    const count = counts.subarray(d * SLOTS, (d + 1) * SLOTS);
    const keys = word === 0 ? lo : hi;
    if (n === 0 || count[(keys[0] >>> shift) & mask] === n) continue;
    let sum = 0;
    for (let k = 0; k <= mask; k++) {
      const c = count[k];
      count[k] = sum;
      sum += c;
    }
    hi2 ??= new Uint32Array(n);
    lo2 ??= new Uint32Array(n);
    idx2 ??= new Uint32Array(new SharedArrayBuffer(4 * n));
    for (let i = 0; i < n; i++) {
      const at = count[(keys[i] >>> shift) & mask]++;
      hi2[at] = hi[i];
      lo2[at] = lo[i];
      idx2[at] = idx[i];
    }
    [hi, hi2] = [hi2, hi];
    [lo, lo2] = [lo2, lo];
    [idx, idx2] = [idx2, idx];
  }
  return idx;
}

/**
 * ranks[v] = 1-based rank of node v (1 = highest score, ties by ascending dense id).
 * @example ranks(Float64Array.of(0.2, 0.5, 0.2)) // [2, 1, 3]
 */
export function ranks(scores: Float64Array): Uint32Array {
  const order = rankOrder(scores);
  const r = new Uint32Array(order.length);
  for (let i = 0; i < order.length; i++) r[order[i]] = i + 1;
  return r;
}

/**
 * The dense ids of the k best nodes in rank order, without sorting all n: a bounded heap whose root is the worst
 * node kept. O(n log k).
 * @example topK(Float64Array.of(0.2, 0.5, 0.3), 2) // [1, 2]
 */
export function topK(scores: Float64Array, k: number): Uint32Array {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`k must be an integer ≥ 0. Value: ${k}`);
  const n = scores.length;
  const size = Math.min(k, n);
  const heap = new Uint32Array(size);
  // a ranks below b
  const worse = (a: number, b: number) => scores[a] < scores[b] || (scores[a] === scores[b] && a > b);
  const siftDown = (from: number, len: number) => {
    let i = from;
    for (;;) {
      const l = 2 * i + 1;
      if (l >= len) return;
      const r = l + 1;
      const w = r < len && worse(heap[r], heap[l]) ? r : l;
      if (!worse(heap[w], heap[i])) return;
      const t = heap[i];
      heap[i] = heap[w];
      heap[w] = t;
      i = w;
    }
  };
  let len = 0;
  for (let v = 0; v < n && size > 0; v++) {
    if (len < size) {
      heap[len] = v;
      let i = len++;
      while (i > 0) {
        const p = (i - 1) >> 1;
        if (!worse(heap[i], heap[p])) break;
        const t = heap[i];
        heap[i] = heap[p];
        heap[p] = t;
        i = p;
      }
    } else if (worse(heap[0], v)) {
      heap[0] = v;
      siftDown(0, len);
    }
  }
  // Pop the worst to the back repeatedly: the array ends best-first.
  for (let end = len - 1; end > 0; end--) {
    const t = heap[0];
    heap[0] = heap[end];
    heap[end] = t;
    siftDown(0, end);
  }
  return heap;
}

/**
 * certain[i] = 1 when position i + 1 of the top k cannot change: with every score within `bound` of its exact
 * value (‖x − π‖₁ ≤ bound), the node's score is more than 2·bound away from both neighbours in rank order.
 * @example certainTop(Float64Array.of(0.5, 0.3, 0.2), 2, 0.01) // { top: [0, 1], certain: [1, 1] }
 */
export function certainTop(scores: Float64Array, k: number, bound: number): { top: Uint32Array; certain: Uint8Array } {
  if (!(bound >= 0)) throw new RangeError(`bound must be ≥ 0. Value: ${bound}`);
  const withNext = topK(scores, k + 1);
  const top = withNext.subarray(0, Math.min(k, scores.length));
  const certain = new Uint8Array(top.length);
  for (let i = 0; i < top.length; i++) {
    const s = scores[top[i]];
    const above = i === 0 || scores[top[i - 1]] - s > 2 * bound;
    const below = i + 1 >= withNext.length || s - scores[withNext[i + 1]] > 2 * bound;
    certain[i] = above && below ? 1 : 0;
  }
  return { top: top.slice(), certain };
}
