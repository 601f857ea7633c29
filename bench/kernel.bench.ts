// Time per iteration of the pull step on an R-MAT graph: JS vs WASM kernel, 1 and 2 threads.
// Usage: tsx bench/kernel.bench.ts [--scale 20] [--edges pairs.bin] [--threads 1,2] [--kernels js,wasm] [--reps 3]
//        [--iterations 12] [--renumber none|out|in] [--cache DIR] [--ref PR_REF_BINARY --ref-edges EDGES_TSV]
// --cache keeps the built (and renumbered) CSR in DIR so later runs skip the build.
// --edges reads little-endian int32 (src, dst) pairs; --ref runs the C reference between our runs (same minute,
// alternated, since the machines are noisy) and prints the ratio of medians.
import { execFileSync } from "node:child_process";
import { existsSync, mkdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { parseArgs } from "node:util";
import { fromDenseEdges, type Graph } from "../workers/src/core/graph";
import { degreeOrder, relabel } from "../workers/src/core/relabel";
import { rank, RankPool, type RankParams } from "../workers/src/engine/rank";
import type { KernelKind } from "../workers/src/engine/rank";

const { values: opt } = parseArgs({
  options: {
    scale: { type: "string", default: "20" },
    edges: { type: "string" },
    threads: { type: "string", default: "1,2" },
    kernels: { type: "string", default: "js,wasm" },
    reps: { type: "string", default: "3" },
    iterations: { type: "string", default: "12" },
    ref: { type: "string" },
    renumber: { type: "string", default: "none" },
    cache: { type: "string" },
    "ref-edges": { type: "string" },
  },
});

/** Graph500 initiator a=0.57 b=0.19 c=0.19 d=0.05, edge factor 16, ids scrambled by an odd multiply mod 2^scale. */
function rmatPairs(scale: number): Uint32Array {
  const m = 16 * 2 ** scale;
  const pairs = new Uint32Array(2 * m);
  let s = 0x9e3779b9;
  const rnd = () => {
    s ^= s << 13;
    s ^= s >>> 17;
    s ^= s << 5;
    return (s >>> 0) / 4294967296;
  };
  const mask = 2 ** scale - 1;
  for (let e = 0; e < m; e++) {
    let u = 0;
    let v = 0;
    for (let l = 0; l < scale; l++) {
      const r = rnd();
      u = (u << 1) | (r >= 0.76 ? 1 : 0);
      v = (v << 1) | ((r >= 0.57 && r < 0.76) || r >= 0.95 ? 1 : 0);
    }
    pairs[2 * e] = Math.imul(u, 0x9e3779b1) & mask;
    pairs[2 * e + 1] = Math.imul(v, 0x9e3779b1) & mask;
  }
  return pairs;
}

/** Dense ids in ascending order of original id (ids that never occur dropped), duplicates and self-loops kept. */
function graphFromPairs(pairs: Uint32Array): Graph {
  let max = 0;
  for (let i = 0; i < pairs.length; i++) if (pairs[i] > max) max = pairs[i];
  const map = new Int32Array(max + 1).fill(-1);
  for (let i = 0; i < pairs.length; i++) map[pairs[i]] = 0;
  let n = 0;
  for (let i = 0; i <= max; i++) if (map[i] === 0) map[i] = n++;
  const m = pairs.length / 2;
  const src = new Uint32Array(m);
  const dst = new Uint32Array(m);
  for (let e = 0; e < m; e++) {
    src[e] = map[pairs[2 * e]];
    dst[e] = map[pairs[2 * e + 1]];
  }
  return fromDenseEdges(n, src, dst);
}

const median = (a: number[]) => {
  const s = [...a].sort((x, y) => x - y);
  return s.length % 2 ? s[s.length >> 1] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

let refMin = Infinity;
function runRef(): number | null {
  if (!opt.ref || !opt["ref-edges"]) return null;
  const out = execFileSync(opt.ref, ["-t", "2", "-i", opt.iterations, "-e", "0", opt["ref-edges"]], { encoding: "utf8" });
  const ms = /iter_s_median=([\d.]+) .*iter_s_min=([\d.]+)/.exec(out);
  if (ms) refMin = Math.min(refMin, Number(ms[2]) * 1000);
  return ms ? Number(ms[1]) * 1000 : null;
}

function loadCached(dir: string): Graph | null {
  if (!existsSync(join(dir, "meta.json"))) return null;
  const { n, m } = JSON.parse(readFileSync(join(dir, "meta.json"), "utf8")) as { n: number; m: number };
  const u32 = (f: string) => new Uint32Array(readFileSync(join(dir, f)).buffer);
  const outWeight = new Float64Array(readFileSync(join(dir, "out-weight.bin")).buffer);
  const ids = BigUint64Array.from({ length: n }, (_, i) => BigInt(i));
  return { n, m, inOffsets: u32("in-offsets.bin"), sources: u32("sources.bin"), weights: null, outWeight, ids: { kind: "integer", ids } };
}

function buildGraph(): Graph {
  const t0 = performance.now();
  const pairs = opt.edges ? new Uint32Array(readFileSync(opt.edges).buffer) : rmatPairs(Number(opt.scale));
  const plain = graphFromPairs(pairs);
  const t1 = performance.now();
  const g = opt.renumber === "none" ? plain : relabel(plain, degreeOrder(plain, opt.renumber === "in" ? "in" : "out"));
  const secs = (a: number, b: number) => ((b - a) / 1000).toFixed(1);
  console.log(`graph built in ${secs(t0, t1)} s, renumbered (${opt.renumber}) in ${secs(t1, performance.now())} s`);
  return g;
}

const cached = opt.cache ? loadCached(opt.cache) : null;
const g = cached ?? buildGraph();
if (opt.cache && !cached) {
  mkdirSync(opt.cache, { recursive: true });
  writeFileSync(join(opt.cache, "in-offsets.bin"), g.inOffsets);
  writeFileSync(join(opt.cache, "sources.bin"), g.sources);
  writeFileSync(join(opt.cache, "out-weight.bin"), g.outWeight);
  writeFileSync(join(opt.cache, "meta.json"), JSON.stringify({ n: g.n, m: g.m, renumber: opt.renumber }));
}
console.log(`graph n=${g.n} m=${g.m}${cached ? " (from cache)" : ""}`);
const iterations = Number(opt.iterations);
const params: RankParams = {
  damping: 0.85,
  tolerance: 0,
  maxIterations: iterations,
  dangling: "uniform",
  teleport: { kind: "uniform" },
  weighted: false,
};
const refMs: number[] = [];
for (const threads of opt.threads.split(",").map(Number)) {
  const pool = new RankPool({ threads });
  for (const kernel of opt.kernels.split(",") as KernelKind[]) {
    const perIter: number[] = [];
    const ratios: number[] = [];
    let best = Infinity;
    for (let rep = 0; rep < Number(opt.reps); rep++) {
      const ms: number[] = [];
      const r = await rank(g, { ...params, threads, shards: threads }, { pool, kernel, onIteration: (p) => void ms.push(p.elapsedMs) });
      if (r.stopReason !== "iteration-cap") console.log(`  run stopped: ${r.stopReason} ${r.failure ? JSON.stringify(r.failure) : ""}`);
      perIter.push(median(ms));
      best = Math.min(best, ...ms);
      const ref = threads === 2 ? runRef() : null;
      if (ref !== null) {
        refMs.push(ref);
        ratios.push(perIter[perIter.length - 1] / ref);
      }
    }
    const med = median(perIter);
    const name = `pull:${kernel}:threads=${threads}:n=${g.n}`;
    console.log(
      `${name.padEnd(36)} ${med.toFixed(2)} ms/iter (min ${best.toFixed(2)})  ${(g.m / med / 1e3).toFixed(0)} M edges/s  (rep medians ${perIter.map((x) => x.toFixed(1)).join(" ")})` +
        (ratios.length ? `  vs C next to it: ×${median(ratios).toFixed(2)} (${ratios.map((x) => x.toFixed(2)).join(" ")})` : ""),
    );
  }
  await pool.close();
}
if (refMs.length) console.log(
  `C reference, 2 threads, alternated: ${median(refMs).toFixed(2)} ms/iter (min ${refMin.toFixed(2)}; run medians ${refMs.map((x) => x.toFixed(1)).join(" ")})`,
);
console.log(`peak RSS ${(process.resourceUsage().maxRSS / 1024).toFixed(0)} MiB, ${iterations} iterations per run`);
