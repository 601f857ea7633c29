// AssemblyScript twin of workers/src/core/pull-step-csr.ts over one shared linear memory; arguments are byte
// offsets of the arrays (0 = absent). Same operations in the same order as the JS kernel, so the same bits.

// x1[v] = alpha·Σ_{u→v} c0[u]·w_uv + (q + p·tel[v]),  c1[v] = x1[v]/W[v] (0 when W[v] = 0), v in [start, end);
// blockSums[3b..3b+2] = (Σ dangling x1, Σ |x1 − x0|, Σ x1) per block b in range.
export function pullStep(
  start: u32,
  end: u32,
  inOffsets: usize,
  sources: usize,
  weights: usize,
  outWeight: usize,
  c0: usize,
  x0: usize,
  x1: usize,
  c1: usize,
  alpha: f64,
  p: f64,
  q: f64,
  tel: usize,
  blockSums: usize,
  blockNodes: u32,
): void {
  for (let b0: u32 = start; b0 < end; b0 += blockNodes) {
    const b1: u32 = min(b0 + blockNodes, end);
    let dang: f64 = 0;
    let res: f64 = 0;
    let sum: f64 = 0;
    let lo: usize = <usize>load<u32>(inOffsets + (<usize>b0 << 2));
    for (let v: u32 = b0; v < b1; v++) {
      const hi: usize = <usize>load<u32>(inOffsets + (<usize>(v + 1) << 2));
      let s0: f64 = 0;
      let s1: f64 = 0;
      let s2: f64 = 0;
      let s3: f64 = 0;
      let e: usize = lo;
      if (weights == 0) {
        for (; e + 3 < hi; e += 4) {
          const sp = sources + (e << 2);
          s0 += load<f64>(c0 + (<usize>load<u32>(sp) << 3));
          s1 += load<f64>(c0 + (<usize>load<u32>(sp, 4) << 3));
          s2 += load<f64>(c0 + (<usize>load<u32>(sp, 8) << 3));
          s3 += load<f64>(c0 + (<usize>load<u32>(sp, 12) << 3));
        }
        if (e < hi) s0 += load<f64>(c0 + (<usize>load<u32>(sources + (e++ << 2)) << 3));
        if (e < hi) s1 += load<f64>(c0 + (<usize>load<u32>(sources + (e++ << 2)) << 3));
        if (e < hi) s2 += load<f64>(c0 + (<usize>load<u32>(sources + (e << 2)) << 3));
      } else {
        for (; e + 3 < hi; e += 4) {
          const sp = sources + (e << 2);
          const wp = weights + (e << 3);
          s0 += load<f64>(c0 + (<usize>load<u32>(sp) << 3)) * load<f64>(wp);
          s1 += load<f64>(c0 + (<usize>load<u32>(sp, 4) << 3)) * load<f64>(wp, 8);
          s2 += load<f64>(c0 + (<usize>load<u32>(sp, 8) << 3)) * load<f64>(wp, 16);
          s3 += load<f64>(c0 + (<usize>load<u32>(sp, 12) << 3)) * load<f64>(wp, 24);
        }
        if (e < hi) {
          s0 += load<f64>(c0 + (<usize>load<u32>(sources + (e << 2)) << 3)) * load<f64>(weights + (e << 3));
          e++;
        }
        if (e < hi) {
          s1 += load<f64>(c0 + (<usize>load<u32>(sources + (e << 2)) << 3)) * load<f64>(weights + (e << 3));
          e++;
        }
        if (e < hi) s2 += load<f64>(c0 + (<usize>load<u32>(sources + (e << 2)) << 3)) * load<f64>(weights + (e << 3));
      }
      lo = hi;
      const vo: usize = <usize>v << 3;
      const base: f64 = tel == 0 ? q : q + p * load<f64>(tel + vo);
      const xv: f64 = alpha * (s0 + s1 + (s2 + s3)) + base;
      const w: f64 = load<f64>(outWeight + vo);
      if (w > 0) {
        store<f64>(c1 + vo, xv / w);
      } else {
        store<f64>(c1 + vo, 0);
        dang += xv;
      }
      res += abs<f64>(xv - load<f64>(x0 + vo));
      sum += xv;
      store<f64>(x1 + vo, xv);
    }
    const slot: usize = blockSums + <usize>(b0 / blockNodes) * 24;
    store<f64>(slot, dang);
    store<f64>(slot, res, 8);
    store<f64>(slot, sum, 16);
  }
}
