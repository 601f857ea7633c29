// AssemblyScript twins of two passes of workers/src/graph-store/build-passes.ts (the count and the partition), for
// a parse lane's own linear memory: the caller copies pieces of arcs in (and the counts, or the relabelled pieces
// grouped by target bucket, out). Arguments are byte offsets into this memory.

// src[i] ← fmap[src[i]], dst[i] ← fmap[dst[i]] for i < k, then the arcs regrouped by bucket[old dst] into outSrc and
// outDst: four interleaved lanes (arc i on lane i mod 4) count and place on their own counters (counts holds
// 4 · buckets words); inside a bucket the arcs sit lane by lane. starts[j] = first arc of bucket j (buckets + 1 words).
export function relabelPartition(
  src: usize,
  dst: usize,
  k: u32,
  fmap: usize,
  bucket: usize,
  buckets: u32,
  tb: usize,
  counts: usize,
  starts: usize,
  outSrc: usize,
  outDst: usize,
): void {
  const n: usize = <usize>k;
  memory.fill(counts, 0, <usize>buckets << 4);
  for (let i: usize = 0; i < n; i++) {
    const x = <usize>load<u32>(dst + (i << 2));
    const b = <usize>load<u8>(bucket + x);
    store<u8>(tb + i, <u8>b);
    const cp = counts + (((b << 2) + (i & 3)) << 2);
    store<u32>(cp, load<u32>(cp) + 1);
    store<u32>(src + (i << 2), load<u32>(fmap + (<usize>load<u32>(src + (i << 2)) << 2)));
    store<u32>(dst + (i << 2), load<u32>(fmap + (x << 2)));
  }
  let at: u32 = 0;
  for (let j: usize = 0; j < <usize>buckets; j++) {
    store<u32>(starts + (j << 2), at);
    for (let lane: usize = 0; lane < 4; lane++) {
      const cp = counts + (((j << 2) + lane) << 2);
      const c = load<u32>(cp);
      store<u32>(cp, at);
      at += c;
    }
  }
  store<u32>(starts + (<usize>buckets << 2), at);
  for (let i: usize = 0; i < n; i++) {
    const cp = counts + (((<usize>load<u8>(tb + i) << 2) + (i & 3)) << 2);
    const p = <usize>load<u32>(cp);
    store<u32>(cp, <u32>p + 1);
    store<u32>(outSrc + (p << 2), load<u32>(src + (i << 2)));
    store<u32>(outDst + (p << 2), load<u32>(dst + (i << 2)));
  }
}

// Lines per stored value over k arcs: outRaw[src[i]] += 1, inRaw[dst[i]] += 1, and selfRaw[x] += 1 for a self-loop
// x → x when selfRaw is set (0 = absent). Twin of countValues in build-passes.ts.
export function countValues(src: usize, dst: usize, k: u32, outRaw: usize, inRaw: usize, selfRaw: usize): void {
  const n: usize = <usize>k;
  for (let i: usize = 0; i < n; i++) {
    const x = <usize>load<u32>(src + (i << 2));
    const y = <usize>load<u32>(dst + (i << 2));
    const op = outRaw + (x << 2);
    store<u32>(op, load<u32>(op) + 1);
    const ip = inRaw + (y << 2);
    store<u32>(ip, load<u32>(ip) + 1);
    if (x == y && selfRaw != 0) {
      const sp = selfRaw + (x << 2);
      store<u32>(sp, load<u32>(sp) + 1);
    }
  }
}
