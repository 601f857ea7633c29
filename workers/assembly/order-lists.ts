// AssemblyScript twins, over a graph's shared linear memory, of placeSorted in workers/src/graph-store/build-passes.ts
// (the in-lists of one target bucket, filled sorted by source) and of the rank order's radix sort. Arguments are byte
// offsets of arrays (0 = absent).

// Orders the bucket's k arcs (us[i] → vs[i]) by source with a least-significant-digit radix sort (digits of at most
// 11 bits over `bits` bits; us2/vs2 are scratch, counts holds 2^11 + 1 words), then places them in that order:
// sources[fill[v]++] = u, so every list fills sorted and a repeat lands right after its equal. A repeat adds 1 to
// dupOut[u]; a first occurrence adds 1 to inDistinct[v]. Returns the number of repeats.
export function orderBucket(
  us: usize,
  vs: usize,
  us2: usize,
  vs2: usize,
  k: u32,
  bits: u32,
  counts: usize,
  fill: usize,
  inOffsets: usize,
  sources: usize,
  inDistinct: usize,
  dupOut: usize,
): u32 {
  const passes: u32 = (bits + 10) / 11;
  const width: u32 = (bits + passes - 1) / passes;
  const mask: u32 = (1 << width) - 1;
  const n: usize = <usize>k;
  let a = us;
  let b = vs;
  let a2 = us2;
  let b2 = vs2;
  let shift: u32 = 0;
  for (let p: u32 = 0; p < passes; p++, shift += width) {
    memory.fill(counts, 0, (<usize>mask + 2) << 2);
    for (let i: usize = 0; i < n; i++) {
      const cp = counts + ((<usize>((load<u32>(a + (i << 2)) >>> shift) & mask) + 1) << 2);
      store<u32>(cp, load<u32>(cp) + 1);
    }
    // A digit every key shares needs no pass.
    if (n > 0 && load<u32>(counts + ((<usize>((load<u32>(a) >>> shift) & mask) + 1) << 2)) == k) continue;
    let sum: u32 = 0;
    for (let d: usize = 1; d <= <usize>mask + 1; d++) {
      const cp = counts + (d << 2);
      sum += load<u32>(cp);
      store<u32>(cp, sum);
    }
    for (let i: usize = 0; i < n; i++) {
      const u = load<u32>(a + (i << 2));
      const cp = counts + (<usize>((u >>> shift) & mask) << 2);
      const at = <usize>load<u32>(cp);
      store<u32>(cp, <u32>at + 1);
      store<u32>(a2 + (at << 2), u);
      store<u32>(b2 + (at << 2), load<u32>(b + (i << 2)));
    }
    let t = a;
    a = a2;
    a2 = t;
    t = b;
    b = b2;
    b2 = t;
  }
  let dups: u32 = 0;
  for (let i: usize = 0; i < n; i++) {
    const u = load<u32>(a + (i << 2));
    const v = <usize>load<u32>(b + (i << 2));
    const fp = fill + (v << 2);
    const at = <usize>load<u32>(fp);
    if (at > <usize>load<u32>(inOffsets + (v << 2)) && load<u32>(sources + ((at - 1) << 2)) == u) {
      dups++;
      if (dupOut != 0) {
        const dp = dupOut + (<usize>u << 2);
        store<u32>(dp, load<u32>(dp) + 1);
      }
    } else if (inDistinct != 0) {
      const ip = inDistinct + (v << 2);
      store<u32>(ip, load<u32>(ip) + 1);
    }
    store<u32>(sources + (at << 2), u);
    store<u32>(fp, <u32>at + 1);
  }
  return dups;
}

// Twin of radixOrder64 in workers/src/output/rank-order.ts: idx = 0..n-1 ordered by the 64-bit keys (hi[i], lo[i])
// ascending, ties by ascending index; a stable LSD radix sort over digits of 11, 11 and 10 bits of each word, a digit
// every key shares skipped. hi2, lo2 and idx2 are scratch of n words each; counts holds 6 · 2048 words. Returns the
// byte offset of the array holding the order (idx or idx2).
export function radixOrder64(hi: usize, lo: usize, idx: usize, hi2: usize, lo2: usize, idx2: usize, n: u32, counts: usize): usize {
  const k: usize = <usize>n;
  memory.fill(counts, 0, 6 * 2048 * 4);
  for (let i: usize = 0; i < k; i++) {
    store<u32>(idx + (i << 2), <u32>i);
    const l = load<u32>(lo + (i << 2));
    const h = load<u32>(hi + (i << 2));
    bump(counts + ((<usize>(l & 0x7ff)) << 2));
    bump(counts + ((2048 + <usize>((l >>> 11) & 0x7ff)) << 2));
    bump(counts + ((4096 + <usize>(l >>> 22)) << 2));
    bump(counts + ((6144 + <usize>(h & 0x7ff)) << 2));
    bump(counts + ((8192 + <usize>((h >>> 11) & 0x7ff)) << 2));
    bump(counts + ((10240 + <usize>(h >>> 22)) << 2));
  }
  let a = hi;
  let b = lo;
  let c = idx;
  let a2 = hi2;
  let b2 = lo2;
  let c2 = idx2;
  for (let d: u32 = 0; d < 6; d++) {
    const shift: u32 = (d % 3) * 11;
    const mask: u32 = d % 3 == 2 ? 0x3ff : 0x7ff;
    const count = counts + ((<usize>d * 2048) << 2);
    const keys = d < 3 ? b : a;
    if (k == 0 || load<u32>(count + (<usize>((load<u32>(keys) >>> shift) & mask) << 2)) == n) continue;
    let sum: u32 = 0;
    for (let j: usize = 0; j <= <usize>mask; j++) {
      const cp = count + (j << 2);
      const v = load<u32>(cp);
      store<u32>(cp, sum);
      sum += v;
    }
    for (let i: usize = 0; i < k; i++) {
      const cp = count + (<usize>((load<u32>(keys + (i << 2)) >>> shift) & mask) << 2);
      const at = <usize>load<u32>(cp);
      store<u32>(cp, <u32>at + 1);
      store<u32>(a2 + (at << 2), load<u32>(a + (i << 2)));
      store<u32>(b2 + (at << 2), load<u32>(b + (i << 2)));
      store<u32>(c2 + (at << 2), load<u32>(c + (i << 2)));
    }
    let t = a;
    a = a2;
    a2 = t;
    t = b;
    b = b2;
    b2 = t;
    t = c;
    c = c2;
    c2 = t;
  }
  return c;
}

@inline
function bump(p: usize): void {
  store<u32>(p, load<u32>(p) + 1);
}
