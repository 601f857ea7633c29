// AssemblyScript twin of workers/src/ingest/fast-scan.ts (scanIntegerLines) over the module's own memory: the same
// accepted lines, the same stop rule (the first line it cannot take, at that line's first byte) and the same weight
// arithmetic, so that either scanner gives the same arrays and counts.

// Lines "digits D digits [D decimal] [\r]\n" from bytes [p, e) (byte e-1 is a newline), D the delimiter (a run of
// spaces/tabs when D is a space); ids below 2^32, decimals of at most 15 characters. At most `cap` lines: ids to
// src/dst (u32), weights to w (f64) when w ≠ 0. stats (f64): [0] lines taken, [1] self-loops (added to),
// [2] largest id, [3] smallest weight, [4] largest weight (updated in place). Returns where the scan stopped.
export function scan(p: usize, e: usize, delim: u32, threeCols: bool, cap: u32, src: usize, dst: usize, w: usize, stats: usize): usize {
  const ws = delim == 32;
  let m: u32 = 0;
  let selfLoops = load<f64>(stats, 8);
  let maxId = load<f64>(stats, 16);
  let wMin = load<f64>(stats, 24);
  let wMax = load<f64>(stats, 32);
  while (p < e && m < cap) {
    let q = p;
    let d = <i32>load<u8>(q) - 48;
    if (<u32>d > 9) break;
    let a: u64 = <u64>d;
    q++;
    while (<u32>(d = <i32>load<u8>(q) - 48) <= 9) {
      a = a * 10 + <u64>d;
      if (a > 0x1_0000_0000) a = 0x1_0000_0000;
      q++;
    }
    let c = <u32>load<u8>(q);
    if (a >= 0x1_0000_0000 || (c != delim && !(ws && c == 9))) break;
    q++;
    if (ws) while ((c = <u32>load<u8>(q)) == 32 || c == 9) q++;
    d = <i32>load<u8>(q) - 48;
    if (<u32>d > 9) break;
    let b: u64 = <u64>d;
    q++;
    while (<u32>(d = <i32>load<u8>(q) - 48) <= 9) {
      b = b * 10 + <u64>d;
      if (b > 0x1_0000_0000) b = 0x1_0000_0000;
      q++;
    }
    if (b >= 0x1_0000_0000) break;
    c = <u32>load<u8>(q);
    let weight: f64 = 1;
    if (threeCols) {
      if (c != delim && !(ws && c == 9)) break;
      q++;
      if (ws) while ((c = <u32>load<u8>(q)) == 32 || c == 9) q++;
      const w0 = q;
      let mant: f64 = 0;
      let dot: isize = -1;
      while (true) {
        d = <i32>load<u8>(q) - 48;
        if (<u32>d <= 9) mant = mant * 10 + <f64>d;
        else if (d == -2 && dot < 0) dot = <isize>q;
        else break;
        q++;
      }
      const len = q - w0;
      if (len == 0 || len > 15 || dot == <isize>w0 || dot == <isize>(q - 1)) break;
      c = <u32>load<u8>(q);
      weight = dot < 0 ? mant : mant / pow10(<i32>(<isize>q - dot - 1));
    }
    if (c == 13) {
      if (load<u8>(q + 1) != 10) break;
      q++;
    } else if (c != 10) break;
    const fa = <f64>a;
    const fb = <f64>b;
    if (fa > maxId) maxId = fa;
    if (fb > maxId) maxId = fb;
    p = q + 1;
    if (threeCols) {
      if (weight < wMin) wMin = weight;
      if (weight > wMax) wMax = weight;
    }
    if (a == b) selfLoops += 1;
    store<u32>(src + (<usize>m << 2), <u32>a);
    store<u32>(dst + (<usize>m << 2), <u32>b);
    if (w != 0) store<f64>(w + (<usize>m << 3), weight);
    m++;
  }
  store<f64>(stats, <f64>m, 0);
  store<f64>(stats, selfLoops, 8);
  store<f64>(stats, maxId, 16);
  store<f64>(stats, wMin, 24);
  store<f64>(stats, wMax, 32);
  return p;
}

/** 10^k for 0 ≤ k ≤ 15, exact (every power up to 10^22 is a double). */
function pow10(k: i32): f64 {
  let r: f64 = 1;
  for (let i = 0; i < k; i++) r *= 10;
  return r;
}
