// Fast path for integer-id lines, storing the ids themselves: "digits D digits [D decimal] [\r]\n", D the delimiter
// (a run of spaces/tabs when D is a space). Ids below 2^32 (accumulated exactly: every partial value is below the
// final one, far below 2^53) and plain decimals of at most 15 characters only; every other line, the first one past
// the edge arrays' capacity included, is left to the caller: the scan stops at that line's first byte.
// Self-loops are counted, not dropped (the graph build applies the policy).
// Invariant: buf[e-1] is a newline, so the digit loops stop inside the buffer without bounds checks.

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];
const TWO32 = 4294967296;

export interface ScanState {
  delim: number;
  threeCols: boolean;
  src: Uint32Array;
  dst: Uint32Array;
  weight: Float64Array | null;
  m: number;
  lines: number;
  dataRows: number;
  selfLoops: number;
  maxId: number;
  weightMin: number;
  weightMax: number;
}

export function scanIntegerLines(buf: Uint8Array, p: number, e: number, st: ScanState): number {
  const D = st.delim;
  const ws = D === 32;
  const threeCols = st.threeCols;
  const src = st.src;
  const dst = st.dst;
  const weight = st.weight;
  const cap = src.length;
  let m = st.m;
  const rows0 = st.dataRows;
  let rows = rows0;
  let selfLoops = st.selfLoops;
  let maxId = st.maxId;
  let wMin = st.weightMin;
  let wMax = st.weightMax;
  while (p < e && m < cap) {
    let q = p;
    let d = buf[q] - 48;
    if (d < 0 || d > 9) break;
    let a = d;
    q++;
    while ((d = buf[q] - 48) >= 0 && d <= 9) {
      a = a * 10 + d;
      q++;
    }
    let c = buf[q];
    if (a >= TWO32 || (c !== D && !(ws && c === 9))) break;
    q++;
    if (ws) while ((c = buf[q]) === 32 || c === 9) q++;
    d = buf[q] - 48;
    if (d < 0 || d > 9) break;
    let b = d;
    q++;
    while ((d = buf[q] - 48) >= 0 && d <= 9) {
      b = b * 10 + d;
      q++;
    }
    if (b >= TWO32) break;
    c = buf[q];
    let w = 1;
    if (threeCols) {
      if (c !== D && !(ws && c === 9)) break;
      q++;
      if (ws) while ((c = buf[q]) === 32 || c === 9) q++;
      const w0 = q;
      let mant = 0;
      let dot = -1;
      while (((d = buf[q] - 48) >= 0 && d <= 9) || (d === -2 && dot < 0)) {
        if (d === -2) dot = q;
        else mant = mant * 10 + d;
        q++;
      }
      const len = q - w0;
      if (len === 0 || len > 15 || dot === w0 || dot === q - 1) break;
      c = buf[q];
      w = dot < 0 ? mant : mant / POW10[q - dot - 1];
    }
    if (c === 13) {
      if (buf[q + 1] !== 10) break;
      q++;
    } else if (c !== 10) break;
    if (a > maxId) maxId = a;
    if (b > maxId) maxId = b;
    p = q + 1;
    rows++;
    if (threeCols) {
      if (w < wMin) wMin = w;
      if (w > wMax) wMax = w;
    }
    if (a === b) selfLoops++;
    src[m] = a;
    dst[m] = b;
    if (weight !== null) weight[m] = w;
    m++;
  }
  st.m = m;
  st.lines += rows - rows0;
  st.dataRows = rows;
  st.selfLoops = selfLoops;
  st.maxId = maxId;
  st.weightMin = wMin;
  st.weightMax = wMax;
  return p;
}
