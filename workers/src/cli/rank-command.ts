// `stillpoint rank <edge-file>`: ingest, iterate, write scores, report (one JSON object with --json).

import { availableParallelism } from "node:os";
import { extname } from "node:path";
import type { Graph, NodeIds } from "../core/graph";
import { rank, RankPool, type RankResult, type ShardPool } from "../engine/rank";
import { LanePool } from "../engine/lane-pool";
import { writeGraphStore } from "../graph-store/write";
import { ingestEdgeFile, type IngestResult } from "../ingest/ingest";
import { rankOrderBytes, rankOrderIn, topK } from "../output/rank-order";
import { writeScores, type ScoreFormat } from "../output/write-scores";
import { assemblyModule } from "../tasks/assembly";
import { progressBar } from "./progress";
import { readSeeds, resolveSeeds } from "./seeds";

export interface RankCommandOptions {
  out?: string;
  damping: number;
  tolerance: number;
  maxIterations: number;
  threads?: number;
  shards?: number;
  weighted: boolean;
  undirected: boolean;
  keepSelfLoops: boolean;
  keepDuplicates: boolean;
  seeds?: string;
  dangling: "teleport" | "uniform";
  top: number;
  json: boolean;
  maxBadLines: number;
  saveGraph?: string;
}

/** Bad input the user can fix: exit code 2. */
export class UsageError extends Error {
  override readonly name = "UsageError";
}

export interface RankReport {
  file: string;
  nodes: number;
  edges: number;
  iterations: number;
  residual: number;
  errorBound: number;
  converged: boolean;
  stopReason: RankResult["stopReason"];
  /** perIteration is the mean over the steps, perIterationMedian their median. */
  timings: { parse: number; build: number; iterate: number; perIteration: number; perIterationMedian: number; write: number; total: number };
  peakRssBytes: number;
  /** Bytes of the prepared graph's arrays (in-offsets, sources, weights, out-weights; ids not counted). */
  graphBytes: number;
  threads: number;
  damping: number;
  tolerance: number;
  weighted: boolean;
  fingerprint: string;
  ingest: {
    rows: number;
    badLines: number;
    selfLoops: number;
    selfLoopsDropped: number;
    duplicates: number;
    danglingNodes: number;
    idKind: string;
    parseThreads: number;
    parseMBps: number;
  };
  out: string | null;
  top: Array<{ rank: number; id: string; score: number; certain: boolean }>;
  failure?: RankResult["failure"];
}

export async function rankCommand(file: string, o: RankCommandOptions): Promise<RankReport> {
  const t0 = performance.now();
  const format = o.out ? scoreFormat(o.out) : null;
  const threads = o.threads ?? availableParallelism();
  const seedList = o.seeds ? await readSeeds(o.seeds) : null;
  let pool: ShardPool | null = null;
  const usePool = (p: ShardPool) => (pool = p);
  try {
    return await rankWith(usePool, file, o, t0, format, threads, seedList);
  } finally {
    // The command exits right after its report: the threads need not be torn down first.
    (pool as ShardPool | null)?.close().catch(() => {});
  }
}

async function rankWith(
  usePool: (pool: ShardPool) => ShardPool,
  file: string,
  o: RankCommandOptions,
  t0: number,
  format: ScoreFormat | null,
  threads: number,
  seedList: Awaited<ReturnType<typeof readSeeds>> | null,
): Promise<RankReport> {

  const parseBar = progressBar("ingest");
  let ingested: IngestResult;
  try {
    ingested = await ingestEdgeFile(
      file,
      {
        directed: !o.undirected,
        weighted: o.weighted,
        selfLoops: o.keepSelfLoops ? "keep" : "drop",
        duplicates: o.keepDuplicates ? "keep" : "merge",
        maxBadLines: o.maxBadLines,
      },
      {
        limits: { threads },
        // Every run here weighs an edge by its merged multiplicity, so repeated sources serve as well as weights.
        duplicateLayout: "repeats",
        onProgress: (p) => parseBar.update(p.bytesRead, p.totalBytes, p.phase === "parse" ? `${p.rows} lines` : "building"),
        // The run steps on the threads that parsed the file: no second set of threads to start while the cores are
        // busy. A file too small for parse threads gets a thread pool of its own.
        keepThreads: true,
      },
    );
  } finally {
    parseBar.stop();
  }
  const pool = usePool(ingested.threads ? new LanePool(ingested.threads) : new RankPool({ threads }));
  const { graph, stats } = ingested;
  if (o.saveGraph) {
    await writeGraphStore(o.saveGraph, graph, { options: ingested.options, stats, fingerprint: stats.fingerprint });
  }
  const seeds = seedList && o.seeds ? resolveSeeds(o.seeds, seedList, graph.ids) : null;

  const iterBar = progressBar("iterate");
  const tRank = performance.now();
  let result: RankResult;
  try {
    result = await rank(
      graph,
      {
        damping: o.damping,
        tolerance: o.tolerance,
        maxIterations: o.maxIterations,
        dangling: o.dangling,
        teleport: seeds ? { kind: "seeds", seeds } : { kind: "uniform" },
        // The graph's weights are the file's weights (--weighted) or the multiplicities of merged duplicates (as
        // weights or as repeated sources): either way they are part of the transition probabilities.
        weighted: graph.weights !== null || graph.mergedEdges !== undefined,
        threads,
        shards: o.shards,
      },
      {
        pool,
        onIteration: (p) => iterBar.update(p.k, o.maxIterations, `k=${p.k} residual ${p.residual.toExponential(2)}`) },
    );
  } finally {
    iterBar.stop();
  }
  const tIterated = performance.now();

  if (o.out && format) {
    // The rank order is sorted in WebAssembly in the graph heap's run space when the run gave it back and it is big
    // enough (its pages are in memory already).
    const heap = graph.heap && graph.heap.free >= rankOrderBytes(graph.n) ? graph.heap : null;
    const loan = heap?.lend() ?? null;
    try {
      const order = loan ? rankOrderIn(loan.heap.memory, assemblyModule("order-lists"), result.scores, (length) => loan.heap.u32(length)) : undefined;
      await writeScores(o.out, format, graph.ids, result.scores, {
        damping: String(o.damping),
        tolerance: String(o.tolerance),
        iterations: String(result.iterations),
        residual: String(result.residual),
        errorBound: String(result.errorBound),
        stopReason: result.stopReason,
        weighted: String(o.weighted),
        dangling: o.dangling,
        teleport: seeds ? "seeds" : "uniform",
        inputFingerprint: stats.fingerprint,
      }, { rowPool: pool, order });
    } finally {
      loan?.release();
    }
  }
  const tWritten = performance.now();

  const parseSeconds = ingested.timings.parseMs / 1000;
  return {
    file,
    nodes: graph.n,
    edges: graph.mergedEdges ?? graph.m,
    iterations: result.iterations,
    residual: result.residual,
    errorBound: result.errorBound,
    converged: result.converged,
    stopReason: result.stopReason,
    timings: {
      parse: round(ingested.timings.parseMs),
      build: round(ingested.timings.numberMs + ingested.timings.buildMs),
      iterate: round(tIterated - tRank),
      perIteration: round(result.timings.perIterationMs),
      perIterationMedian: round(result.timings.medianIterationMs),
      write: round(tWritten - tIterated),
      total: round(tWritten - t0),
    },
    peakRssBytes: process.resourceUsage().maxRSS * 1024,
    graphBytes: graph.inOffsets.byteLength + graph.sources.byteLength + (graph.weights?.byteLength ?? 0) + graph.outWeight.byteLength,
    threads,
    damping: o.damping,
    tolerance: o.tolerance,
    weighted: o.weighted,
    fingerprint: stats.fingerprint,
    ingest: {
      rows: stats.rows,
      badLines: stats.badLines,
      selfLoops: stats.selfLoops,
      selfLoopsDropped: stats.selfLoopsDropped,
      duplicates: stats.duplicates,
      danglingNodes: stats.danglingNodes,
      idKind: stats.idKind,
      parseThreads: stats.threads,
      parseMBps: round(stats.bytesRead / 1e6 / Math.max(parseSeconds, 1e-9)),
    },
    out: o.out ?? null,
    top: topList(graph, result, o.top),
    ...(result.failure ? { failure: result.failure } : {}),
  };
}

/** The k best nodes; a position is certain when both neighbours' scores differ from it by more than twice the bound. */
function topList(graph: Graph, result: RankResult, k: number): RankReport["top"] {
  if (k <= 0) return [];
  const order = topK(result.scores, Math.min(k + 1, graph.n));
  const gap = 2 * result.errorBound;
  const s = (i: number) => result.scores[order[i]];
  const rows: RankReport["top"] = [];
  for (let i = 0; i < Math.min(k, order.length); i++) {
    const above = i === 0 || s(i - 1) - s(i) > gap;
    const below = i + 1 >= order.length || s(i) - s(i + 1) > gap;
    rows.push({ rank: i + 1, id: idText(graph.ids, order[i]), score: s(i), certain: result.converged && above && below });
  }
  return rows;
}

function idText(ids: NodeIds, v: number): string {
  if (ids.kind === "integer") return ids.ids[v].toString();
  return new TextDecoder().decode(ids.bytes.subarray(ids.offsets[v], ids.offsets[v + 1]));
}

function scoreFormat(path: string): ScoreFormat {
  const ext = extname(path).toLowerCase();
  if (ext === ".csv" || ext === ".arrow" || ext === ".parquet") return ext.slice(1) as ScoreFormat;
  throw new UsageError(`--out must end in .csv, .arrow or .parquet (got "${path}")`);
}

function round(ms: number): number {
  return Math.round(ms * 1000) / 1000;
}

export function humanReport(r: RankReport): string {
  const lines = [
    `${r.file}: ${count(r.nodes, "node")}, ${count(r.edges, "edge")} (${count(r.ingest.rows, "row")}; ` +
      `${count(r.ingest.selfLoopsDropped, "self-loop")} dropped, ${count(r.ingest.duplicates, "duplicate")} merged, ` +
      `${r.ingest.danglingNodes} dangling, ${count(r.ingest.badLines, "bad line")} skipped)`,
    `${stopText(r)} after ${r.iterations} iterations: L1 residual ${r.residual.toExponential(3)}, ` +
      `error bound ${r.errorBound.toExponential(3)} (damping ${r.damping}, tolerance ${r.tolerance})`,
    `time: parse ${ms(r.timings.parse)}, build ${ms(r.timings.build)}, iterate ${ms(r.timings.iterate)} ` +
      `(${ms(r.timings.perIteration)} per iteration), write ${ms(r.timings.write)}, total ${ms(r.timings.total)}; ` +
      `peak memory ${(r.peakRssBytes / 2 ** 20).toFixed(0)} MiB`,
  ];
  if (r.failure) lines.push(`failure: shard ${r.failure.shard} after ${r.failure.attempts} attempts: ${r.failure.lastError}`);
  if (r.top.length > 0) {
    const width = Math.max(4, ...r.top.map((t) => t.id.length));
    lines.push("", `rank  ${"node".padEnd(width)}  score`);
    for (const t of r.top) lines.push(`${String(t.rank).padStart(4)}  ${t.id.padEnd(width)}  ${t.score.toExponential(6)}${t.certain ? "" : "  (order not certain)"}`);
  }
  if (r.out) lines.push("", `scores written to ${r.out}`);
  return lines.join("\n");
}

function count(n: number, word: string): string {
  return `${n} ${word}${n === 1 ? "" : "s"}`;
}

function stopText(r: RankReport): string {
  if (r.stopReason === "converged") return "converged";
  if (r.stopReason === "iteration-cap") return "NOT converged (iteration cap reached)";
  return r.stopReason;
}

function ms(v: number): string {
  return v >= 1000 ? `${(v / 1000).toFixed(2)} s` : `${v.toFixed(1)} ms`;
}
