// Fast path for integer-id lines once ids reach 2^32 ("int" mode): "digits D digits [D decimal] [\r]\n" as in
// fast-scan.ts, but ids go up to 2^64 − 1, exactly: the first 15 digits accumulate in a double (below 2^50), the
// remaining r ≤ 5 digits separately, and value = head·10^r + tail is formed in 32-bit halves (every intermediate below
// 2^53). Written as lo into src/dst and hi into hiSrc/hiDst at [m − m0]. A larger value, a longer digit string and
// every other unusual line are left to the caller: the scan stops at that line's first byte.
// Invariant: buf[e-1] is a newline, so the digit loops stop inside the buffer without bounds checks.

import type { ScanState } from "./fast-scan";

const POW10 = [1, 10, 100, 1e3, 1e4, 1e5, 1e6, 1e7, 1e8, 1e9, 1e10, 1e11, 1e12, 1e13, 1e14, 1e15];
const TWO32 = 4294967296;

export function scanWideLines(buf: Uint8Array, p: number, e: number, st: ScanState, hiSrc: Uint32Array, hiDst: Uint32Array, m0: number): number {
  const D = st.delim;
  const ws = D === 32;
  const threeCols = st.threeCols;
  const src = st.src;
  const dst = st.dst;
  const weight = st.weight;
  const cap = Math.min(src.length, m0 + hiSrc.length);
  let m = st.m;
  const rows0 = st.dataRows;
  let rows = rows0;
  let selfLoops = st.selfLoops;
  let wMin = st.weightMin;
  let wMax = st.weightMax;
  while (p < e && m < cap) {
    let q = p;
    let d = buf[q] - 48;
    if (d < 0 || d > 9) break;
    let head = 0;
    let tail = 0;
    let digits = 0;
    do {
      if (digits < 15) head = head * 10 + d;
      else tail = tail * 10 + d;
      digits++;
      q++;
    } while ((d = buf[q] - 48) >= 0 && d <= 9);
    if (digits > 20) break;
    let p10 = POW10[digits > 15 ? digits - 15 : 0];
    let hi0 = Math.floor(head / TWO32);
    let lo1 = (head - hi0 * TWO32) * p10 + tail;
    let carry = Math.floor(lo1 / TWO32);
    const aLo = lo1 - carry * TWO32;
    const aHi = hi0 * p10 + carry;
    let c = buf[q];
    if (aHi >= TWO32 || (c !== D && !(ws && c === 9))) break;
    q++;
    if (ws) while ((c = buf[q]) === 32 || c === 9) q++;
    d = buf[q] - 48;
    if (d < 0 || d > 9) break;
    head = 0;
    tail = 0;
    digits = 0;
    do {
      if (digits < 15) head = head * 10 + d;
      else tail = tail * 10 + d;
      digits++;
      q++;
    } while ((d = buf[q] - 48) >= 0 && d <= 9);
    if (digits > 20) break;
    p10 = POW10[digits > 15 ? digits - 15 : 0];
    hi0 = Math.floor(head / TWO32);
    lo1 = (head - hi0 * TWO32) * p10 + tail;
    carry = Math.floor(lo1 / TWO32);
    const bLo = lo1 - carry * TWO32;
    const bHi = hi0 * p10 + carry;
    if (bHi >= TWO32) break;
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
    p = q + 1;
    rows++;
    if (threeCols) {
      if (w < wMin) wMin = w;
      if (w > wMax) wMax = w;
    }
    if (aLo === bLo && aHi === bHi) selfLoops++;
    src[m] = aLo;
    dst[m] = bLo;
    hiSrc[m - m0] = aHi;
    hiDst[m - m0] = bHi;
    if (weight !== null) weight[m] = w;
    m++;
  }
  st.m = m;
  st.lines += rows - rows0;
  st.dataRows = rows;
  st.selfLoops = selfLoops;
  st.weightMin = wMin;
  st.weightMax = wMax;
  return p;
}
