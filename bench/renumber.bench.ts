// Does renumbering nodes hubs first pay? Same R-MAT file, ingested with and without it, iterated alternately.
//   npx tsx bench/renumber.bench.ts [--scale 20] [--runs 3] [--threads N]

import { availableParallelism } from "node:os";
import { rank } from "../workers/src/engine/rank";
import { ingestEdgeFile } from "../workers/src/ingest/ingest";
import { rmatFile } from "./rmat";

function arg(name: string, fallback: number): number {
  const i = process.argv.indexOf(`--${name}`);
  return i >= 0 ? Number(process.argv[i + 1]) : fallback;
}

const scale = arg("scale", 20);
const runs = arg("runs", 3);
const threads = arg("threads", availableParallelism());
const file = await rmatFile(scale);
const options = { selfLoops: "keep" as const };
const variants = [
  { name: "hubs first", graph: (await ingestEdgeFile(file, options, { renumber: true })).graph },
  { name: "original-id order", graph: (await ingestEdgeFile(file, options, { renumber: false })).graph },
];
const perIteration: number[][] = variants.map(() => []);
for (let r = 0; r < runs; r++) {
  for (const [k, v] of variants.entries()) {
    const result = await rank(v.graph, {
      damping: 0.85,
      tolerance: 1e-9,
      maxIterations: 200,
      dangling: "teleport",
      teleport: { kind: "uniform" },
      weighted: v.graph.weights !== null,
      threads,
    });
    perIteration[k].push(result.timings.perIterationMs);
  }
}
const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1];
console.log(`R-MAT scale ${scale}, ${variants[0].graph.n} nodes, ${variants[0].graph.m} edges, ${threads} threads, ${runs} runs`);
for (const [k, v] of variants.entries()) console.log(`  ${v.name.padEnd(18)} ${median(perIteration[k]).toFixed(2)} ms per iteration`);
console.log(`  ratio              ${(median(perIteration[1]) / median(perIteration[0])).toFixed(2)}× slower without renumbering`);
