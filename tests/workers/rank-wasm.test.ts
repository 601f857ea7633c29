// The WebAssembly step kernel: the committed binary is what the source compiles to, and it gives the JS kernel's bits.
import { readFile } from "node:fs/promises";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BLOCK_NODES } from "../../workers/src/core/graph";
import { contributions, pullStep, type StepArgs } from "../../workers/src/core/pull-step";
import { BLOCK_SLOTS } from "../../workers/src/core/pull-step-csr";
import { teleportVector } from "../../workers/src/core/teleport";
import { rank, RankPool, type RankParams } from "../../workers/src/engine/rank";
import { instantiateStep, WASM_FILE, wasmStep } from "../../workers/src/tasks/wasm-step";
import { compileAssembly } from "../fixtures/assembly";
import { applyPolicies, PARAMS, randomEdges, sameBits, toGraph } from "./rank-test-graphs";

describe("committed wasm binary", () => {
  it("matches a fresh compile of workers/assembly/pull-step.ts (npm run build:wasm)", async () => {
    const fresh = await compileAssembly("workers/assembly/pull-step.ts", "release");
    expect(Buffer.compare(Buffer.from(fresh), await readFile(WASM_FILE))).toBe(0);
  });
});

/** Step arguments with every array placed in one shared wasm memory (first page left empty). */
function argsInMemory(weighted: boolean, seeded: boolean): { args: StepArgs; memory: WebAssembly.Memory } {
  const g = toGraph(applyPolicies(randomEdges(31, 3 * BLOCK_NODES + 50, 5), true));
  const n = g.n;
  const memory = new WebAssembly.Memory({ initial: 300, maximum: 300, shared: true });
  let at = 65_536;
  const f64 = (len: number) => {
    const a = new Float64Array(memory.buffer, at, len);
    at += len * 8;
    return a;
  };
  const u32 = (len: number) => {
    const a = new Uint32Array(memory.buffer, at, len);
    at += Math.ceil(len / 2) * 8;
    return a;
  };
  const inOffsets = u32(n + 1);
  inOffsets.set(g.inOffsets);
  const sources = u32(g.m);
  sources.set(g.sources);
  const weights = weighted ? f64(g.m) : null;
  weights?.set(g.weights as Float64Array);
  const outWeight = f64(n);
  outWeight.set(g.outWeight);
  const tel = seeded ? f64(n) : null;
  tel?.set(teleportVector(n, [{ node: 3, weight: 1 }, { node: 9000, weight: 2 }]));
  const x0 = f64(n);
  for (let v = 0; v < n; v++) x0[v] = ((v * 7919) % 1000) / (500 * n);
  const c0 = f64(n);
  const blockSums = f64(Math.ceil(n / BLOCK_NODES) * BLOCK_SLOTS);
  contributions({ start: 0, end: n, x: x0, outWeight, c: c0, blockSums, blockNodes: BLOCK_NODES });
  const args: StepArgs = {
    start: BLOCK_NODES, end: n, inOffsets, sources, weights, outWeight, c0, x0, x1: f64(n), c1: f64(n),
    scalars: { alpha: 0.85, p: 0.3, q: 0.15 / n }, tel, blockSums, blockNodes: BLOCK_NODES,
  };
  return { args, memory };
}

describe("wasm kernel = JS kernel, bit for bit", () => {
  for (const [weighted, seeded] of [[false, false], [true, false], [false, true], [true, true]] as const) {
    it(`one step (${weighted ? "weighted" : "unweighted"}, ${seeded ? "seeded" : "uniform"} teleport)`, () => {
      const { args, memory } = argsInMemory(weighted, seeded);
      const kernel = instantiateStep(memory);
      args.blockSums.fill(0);
      wasmStep(kernel, args);
      const wasm = [args.x1.slice(), args.c1.slice(), args.blockSums.slice()];
      args.x1.fill(0);
      args.c1.fill(0);
      args.blockSums.fill(0);
      pullStep(args);
      expect(args.x1[BLOCK_NODES]).toBeGreaterThan(0);
      expect(args.x1[0]).toBe(0);
      expect(sameBits(wasm[0], args.x1)).toBe(true);
      expect(sameBits(wasm[1], args.c1)).toBe(true);
      expect(sameBits(wasm[2], args.blockSums)).toBe(true);
    });
  }

  it("rejects bad shapes before entering the kernel", () => {
    const { args, memory } = argsInMemory(true, false);
    expect(() => wasmStep(instantiateStep(memory), { ...args, end: 5 })).toThrow(/end must be/);
  });

  describe("whole runs", () => {
    let pool: RankPool;
    beforeAll(() => {
      pool = new RankPool({ threads: 2 });
    });
    afterAll(() => pool.close());
    const g = toGraph(applyPolicies(randomEdges(77, 6 * BLOCK_NODES, 4), true));
    const variants: Partial<RankParams>[] = [
      {},
      { weighted: true, dangling: "uniform", teleport: { kind: "seeds", seeds: [{ node: 12, weight: 1 }] } },
    ];
    for (const p of variants) {
      it(`js and wasm runs agree (${JSON.stringify(p)})`, async () => {
        const js = await rank(g, { ...PARAMS, ...p, shards: 3 }, { pool, kernel: "js" });
        const wasm = await rank(g, { ...PARAMS, ...p, shards: 2 }, { pool, kernel: "wasm" });
        expect([js.kernel, wasm.kernel]).toEqual(["js", "wasm"]);
        expect(js.iterations).toBe(wasm.iterations);
        expect(sameBits(js.scores, wasm.scores)).toBe(true);
      });
    }
  });
});
