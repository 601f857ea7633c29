// Original ids in sorted order: integers ascending as unsigned 64-bit numbers, strings by their UTF-8 bytes.
import type { NodeIds } from "../core/graph";
import { radixOrder64 } from "../output/rank-order";

/**
 * Byte-wise order of a[a0..a1) and b[b0..b1): negative, zero or positive (a shorter prefix sorts first).
 * @example compareBytes(Uint8Array.of(97), 0, 1, Uint8Array.of(97, 98), 0, 2) // -1
 */
export function compareBytes(a: Uint8Array, a0: number, a1: number, b: Uint8Array, b0: number, b1: number): number {
  const la = a1 - a0;
  const lb = b1 - b0;
  const len = la < lb ? la : lb;
  for (let i = 0; i < len; i++) {
    const d = a[a0 + i] - b[b0 + i];
    if (d !== 0) return d;
  }
  return la - lb;
}

/** Order of two unsigned 64-bit numbers given as (hi, lo) 32-bit halves. */
export function compareU64(hiA: number, loA: number, hiB: number, loB: number): number {
  if (hiA !== hiB) return hiA < hiB ? -1 : 1;
  if (loA !== loB) return loA < loB ? -1 : 1;
  return 0;
}

/** perm[s] = index of the s-th smallest value (radix sort over the two 32-bit words). O(n). */
function sortU64(values: BigUint64Array): Uint32Array {
  const n = values.length;
  const words = new Uint32Array(values.buffer, values.byteOffset, n * 2);
  const lo = new Uint32Array(n);
  const hi = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    lo[i] = words[2 * i];
    hi[i] = words[2 * i + 1];
  }
  return radixOrder64(hi, lo);
}

const SMALL = 6;
const KEY_BYTES = 5;
const KEY_BASE = 512;

/**
 * perm[s] = index of the s-th smallest string by UTF-8 bytes: three-way radix quicksort (Bentley & Sedgewick 1997)
 * on 5-byte digits, each byte as 1..256 and 0 past the end (45 bits, exact in a double). Each element's digit,
 * start and end travel with it in parallel arrays, so partitioning reads memory in order and the bytes are touched
 * once per digit position, not once per partition pass.
 */
function sortStrings(bytes: Uint8Array, offsets: Uint32Array): Uint32Array {
  const n = offsets.length - 1;
  const idx = new Uint32Array(n);
  const start = new Uint32Array(n);
  const end = new Uint32Array(n);
  const keys = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    idx[i] = i;
    start[i] = offsets[i];
    end[i] = offsets[i + 1];
  }
  const swap = (i: number, j: number) => {
    let t = idx[i];
    idx[i] = idx[j];
    idx[j] = t;
    t = start[i];
    start[i] = start[j];
    start[j] = t;
    t = end[i];
    end[i] = end[j];
    end[j] = t;
    const kt = keys[i];
    keys[i] = keys[j];
    keys[j] = kt;
  };
  // Jobs of four numbers: lo, hi, depth, and whether keys[lo..hi) already hold the digit at that depth.
  const stack: number[] = [0, n, 0, 0];
  while (stack.length > 0) {
    let valid = stack.pop() === 1;
    let depth = stack.pop() as number;
    let hi = stack.pop() as number;
    let lo = stack.pop() as number;
    for (;;) {
      if (hi - lo <= SMALL) {
        // Every string here shares its first `depth` bytes and is at least that long.
        for (let i = lo + 1; i < hi; i++) {
          for (let j = i; j > lo && compareBytes(bytes, start[j - 1] + depth, end[j - 1], bytes, start[j] + depth, end[j]) > 0; j--) swap(j - 1, j);
        }
        break;
      }
      if (!valid) {
        for (let i = lo; i < hi; i++) {
          const s = start[i] + depth;
          const e = end[i];
          let k = 0;
          for (let j = 0; j < KEY_BYTES; j++) k = k * KEY_BASE + (s + j < e ? bytes[s + j] + 1 : 0);
          keys[i] = k;
        }
      }
      const k0 = keys[lo];
      const k1 = keys[(lo + hi) >>> 1];
      const k2 = keys[hi - 1];
      const pivot = Math.max(Math.min(k0, k1), Math.min(Math.max(k0, k1), k2));
      let lt = lo;
      let gt = hi - 1;
      let i = lo;
      while (i <= gt) {
        const k = keys[i];
        if (k < pivot) swap(lt++, i++);
        else if (k > pivot) swap(i, gt--);
        else i++;
      }
      if (lt - lo > 1) stack.push(lo, lt, depth, 1);
      if (hi - gt - 1 > 1) stack.push(gt + 1, hi, depth, 1);
      // A zero last digit means the pivot string ended: the equal part holds copies of one string.
      if (pivot % KEY_BASE === 0) break;
      lo = lt;
      hi = gt + 1;
      depth += KEY_BYTES;
      valid = false;
    }
  }
  return idx;
}

/**
 * perm[slot] = dense id of the node whose original id is the slot-th smallest. Ids are distinct, so the order is
 * total.
 * @example sortedIdOrder({ kind: "integer", ids: BigUint64Array.of(30n, 10n, 20n) }) // [1, 2, 0]
 */
export function sortedIdOrder(ids: NodeIds): Uint32Array {
  return ids.kind === "integer" ? sortU64(ids.ids) : sortStrings(ids.bytes, ids.offsets);
}
