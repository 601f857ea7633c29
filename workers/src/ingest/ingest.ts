// Ingest an edge-list file into a Graph: read chunks of whole lines (hashing the raw bytes), parse them on worker
// threads (or this thread for small inputs), restore global line numbers and file order, number nodes canonically,
// then build the graph in slices on the same threads.
// Memory: parsed lines take 8 bytes each (+8 with weights); the build adds 4 bytes per arc grouped by source (+8 with
// weights) and the final arrays (4 bytes per arc, +8 with weights or merged duplicates), so the peak is about 16 bytes
// a line unweighted with duplicates kept, 24 merged, 40 weighted, plus ~40 bytes a node and up to 64 MiB of read
// buffers: 2–4× the prepared graph (the benchmark prints the measured ratio).

import { availableParallelism } from "node:os";
import type { Graph } from "../core/graph";
import { buildGraph, LOCAL_RUNNER, reserveGraph, type BuildPolicy, type GraphReserve, type PassRunner } from "../graph-store/build";
import { commonMode, directLimit, numberNodes, type CanonicalEdges, type EdgeSegment } from "./assemble";
import { describeBadLine, IngestError, type BadLine } from "./errors";
import { LocalLane, WorkerLane, type ChunkAck, type Lane } from "./lanes";
import { BAD_LINE_SAMPLES, type IdMode, type ParsedPart, type ParserConfig } from "./line-parser";
import { resolveGraphOptions, resolveLimits, type GraphOptions, type IngestLimits } from "./options";
import { sniffFormat } from "./sniff";
import { ChunkReader } from "./source";
import { scanModule } from "./wasm-scan";
import { degreeStats, type GraphStats } from "./stats";

export interface IngestProgress {
  phase: "parse" | "build";
  bytesRead: number;
  totalBytes: number;
  rows: number;
}

export interface IngestRun {
  limits?: Partial<IngestLimits>;
  /** Renumber nodes hubs first (default true). */
  renumber?: boolean;
  /** How merged duplicates of an unweighted file are stored (see BuildPolicy). */
  duplicateLayout?: "weights" | "repeats";
  /** Smallest graph put on a shared heap (see BuildPolicy). */
  heapMinBytes?: number;
  /** Bytes of in-lists per target bucket of the build (see BuildPolicy). */
  bucketBytes?: number;
  /** Hand the parse threads to the caller (IngestResult.threads) instead of stopping them, e.g. for a LanePool. */
  keepThreads?: boolean;
  onProgress?: (p: IngestProgress) => void;
  /** Number ids through hash tables even when a direct table would do (tests compare both paths). */
  hashIds?: boolean;
  /** Scan integer lines in JS instead of WebAssembly (tests compare both). */
  jsScanner?: boolean;
}

export interface IngestResult {
  graph: Graph;
  stats: GraphStats;
  /** The first bad lines (at most 100), by line number. */
  badLines: BadLine[];
  options: GraphOptions;
  /** Wall times; parseBusyMs adds up the time parse lanes spent parsing (CPU time, across threads). */
  timings: { parseMs: number; parseBusyMs: number; numberMs: number; buildMs: number; totalMs: number };
  /** With run.keepThreads, the worker threads that parsed the file (none for a small file): the caller closes them. */
  threads?: WorkerLane[];
}

// Chunks queued per worker: enough that a busy calling thread (reading, hashing) does not leave workers idle.
const MAX_INFLIGHT = 4;

export async function ingestEdgeFile(path: string, options: Partial<GraphOptions> = {}, run: IngestRun = {}): Promise<IngestResult> {
  const opts = resolveGraphOptions(options);
  const limits = resolveLimits(run.limits);
  const t0 = performance.now();
  const reader = await ChunkReader.open(path, limits);
  const threads = limits.threads > 0 ? limits.threads : Math.min(8, availableParallelism());
  const textBytes = reader.gzip ? reader.size * 4 : reader.size;
  const workerCount = threads < 2 || textBytes < limits.parallelMinBytes ? 0 : threads;
  // Worker threads start now; until one is up, chunks are parsed here (lane index workerCount).
  const workers = Array.from({ length: workerCount }, () => new WorkerLane());
  const lanes: Lane[] = [...workers, new LocalLane()];
  // Worker lanes the caller keeps (run.keepThreads): not stopped here.
  let kept = 0;
  try {
    const first = await reader.next();
    if (reader.size === 0 || !first) throw new IngestError("empty-file", path, `${path}: the file is empty`);
    const sample = new Uint8Array(first.buffer, 0, first.len);
    const format = sniffFormat(sample, opts, limits.sampleLines);
    const probe = sample.subarray(0, Math.min(sample.length, 1 << 18));
    const lineBytes = probe.length / Math.max(1, countNewlines(probe));
    const expectedLines = (textBytes / lineBytes) * 1.03;
    const cfg: ParserConfig = {
      format,
      keepWeights: opts.weighted,
      maxFieldBytes: limits.maxFieldBytes,
      maxBadLines: opts.maxBadLines,
      atFileStart: false,
      // A lane may get more than its share of the chunks (the least busy one gets the next): room for 1.5 shares.
      // Untouched room costs address space only; growing means a copy into fresh pages.
      expectedLines: Math.min(expectedLines, (1.5 * expectedLines) / Math.max(1, workerCount)),
      hashIds: run.hashIds,
      scanModule: run.jsScanner ? null : scanModule(),
    };
    for (const lane of lanes) lane.init(workerCount > 0 && lane instanceof LocalLane ? { ...cfg, expectedLines: 1 << 20 } : cfg);

    // Parse: each chunk goes to the least busy ready worker; while none is ready, to the local lane.
    const acks: ChunkAck[] = [];
    const laneOf: number[] = [];
    const lastAck: Array<ChunkAck | null> = lanes.map(() => null);
    const pending = new Set<Promise<void>>();
    let failure: unknown = null;
    let stop = false;
    let rows = 0;
    for (let chunk: typeof first | null = first; chunk && !stop && failure === null; chunk = await reader.next()) {
      let li = pickLane(lanes, workerCount);
      while (lanes[li].inflight >= MAX_INFLIGHT) {
        await Promise.race(pending);
        li = pickLane(lanes, workerCount);
      }
      laneOf[chunk.seq] = li;
      const p: Promise<void> = lanes[li].send(chunk, chunk.seq === 0).then(
        (ack) => {
          acks[ack.seq] = ack;
          const prev = lastAck[li];
          if (!prev || prev.seq < ack.seq) lastAck[li] = ack;
          reader.release(ack.buffer);
          rows += ack.linesAfter - ack.linesBefore;
          if (ack.stopped) stop = true;
          run.onProgress?.({ phase: "parse", bytesRead: reader.bytesRead, totalBytes: reader.size, rows });
        },
        (e: unknown) => {
          failure = e;
        },
      );
      pending.add(p);
      void p.finally(() => pending.delete(p));
    }
    await Promise.all(pending);
    if (failure !== null) throw failure;

    let mode: IdMode = commonMode(lastAck.flatMap((a) => (a ? [a.mode] : [])));
    const totalEdges = acks.reduce((s, a) => s + (a.edgesAfter - a.edgesBefore), 0);
    const maxId = Math.max(-1, ...lastAck.map((a) => a?.maxId ?? -1));
    if (mode === "raw" && maxId + 1 > directLimit(totalEdges)) mode = "int";
    const used = lanes.flatMap((_, i) => (lastAck[i] !== null ? [i] : []));
    const parts = await Promise.all(used.map((i) => lanes[i].finish(mode)));
    const partOfLane = new Map(used.map((lane, k) => [lane, k]));
    const partOf = laneOf.map((lane) => partOfLane.get(lane) as number);
    const tParsed = performance.now();

    const { badLines, counts } = reconcile(acks, partOf, parts);
    checkCounts(path, reader.size, counts, badLines, opts.maxBadLines);

    run.onProgress?.({ phase: "build", bytesRead: reader.bytesRead, totalBytes: reader.size, rows: counts.lines });
    const runner = workerCount > 0 ? laneRunner(workers) : LOCAL_RUNNER;
    // A big graph's heap is made as soon as the threads are free, so that they fault in its pages while this thread
    // numbers the nodes. Its size: at most every stored id a node, and the arcs the policies leave.
    const dropSelf = opts.selfLoops === "drop";
    const arcs = opts.directed
      ? totalEdges - (dropSelf ? counts.selfLoops : 0)
      : 2 * totalEdges - counts.selfLoops * (dropSelf ? 2 : 1);
    const nodesAtMost = parts.reduce((s, p) => s + (mode === "raw" ? 0 : p.nodes), mode === "raw" ? maxId + 1 : 0);
    const wide = parts.some((p) => p.weight !== null) || opts.duplicates === "merge";
    const buildPolicy: BuildPolicy = {
      directed: opts.directed,
      selfLoops: opts.selfLoops,
      duplicates: opts.duplicates,
      renumber: run.renumber ?? true,
      duplicateLayout: run.duplicateLayout,
      heapMinBytes: run.heapMinBytes,
      bucketBytes: run.bucketBytes,
      touchRunSpace: run.keepThreads,
    };
    let reserve: GraphReserve | null = null;
    const numbering = await numberNodes(parts, { directed: opts.directed, dropSelfLoops: dropSelf }, runner, () => {
      reserve = reserveGraph(nodesAtMost, arcs, wide, buildPolicy, runner);
    });
    const segments: EdgeSegment[] = acks.map((a) => {
      const k = partOf[a.seq];
      const part = parts[k];
      return {
        src: part.src.subarray(a.edgesBefore, a.edgesAfter),
        dst: part.dst.subarray(a.edgesBefore, a.edgesAfter),
        weight: part.weight ? part.weight.subarray(a.edgesBefore, a.edgesAfter) : null,
        map: numbering.maps[k],
      };
    });
    const canonical: CanonicalEdges = {
      n: numbering.n,
      ids: numbering.ids,
      segments,
      degrees: numbering.degrees,
      spare: numbering.spare,
    };
    const tNumbered = performance.now();
    const { graph, report, degrees: built } = await buildGraph(canonical, buildPolicy, runner, reserve);
    const degrees = degreeStats(graph, built);
    const tBuilt = performance.now();

    const warnings: string[] = [];
    if (opts.weighted && format.columns === 2) warnings.push("weighted was requested but the file has no weight column: every edge weighs 1");
    if (!opts.weighted && format.columns === 3) warnings.push("the weight column was checked but not used (the graph is unweighted)");
    if (format.idKind === "integer" && numbering.ids.kind === "string")
      warnings.push("a non-integer id appeared after the sampled lines: all ids were treated as strings");
    const stats: GraphStats = {
      format: { ...format, idKind: numbering.ids.kind, gzip: reader.gzip },
      lines: counts.lines,
      rows: counts.dataRows,
      commentLines: counts.commentLines,
      blankLines: counts.blankLines,
      headerLines: counts.headerLines,
      badLines: counts.badLines,
      nodes: graph.n,
      edges: graph.mergedEdges ?? graph.m,
      selfLoops: counts.selfLoops,
      selfLoopsDropped: report.selfLoopsDropped,
      duplicates: report.duplicatesMerged,
      danglingNodes: degrees.danglingNodes,
      idKind: numbering.ids.kind,
      weight: format.columns === 3 && counts.dataRows > 0 ? { min: counts.weightMin, max: counts.weightMax } : null,
      weighted: graph.weights !== null && opts.weighted,
      inDegree: degrees.inDegree,
      outDegree: degrees.outDegree,
      maxInDegree: degrees.maxInDegree,
      maxOutDegree: degrees.maxOutDegree,
      fingerprint: reader.fingerprint(),
      bytesRead: reader.bytesRead,
      threads: Math.max(1, workerCount),
      idPath: numbering.idPath,
      order: report.order,
      warnings,
    };
    const result: IngestResult = {
      graph,
      stats,
      badLines,
      options: opts,
      timings: {
        parseMs: tParsed - t0,
        parseBusyMs: acks.reduce((sum, a) => sum + a.busyMs, 0),
        numberMs: tNumbered - tParsed,
        buildMs: tBuilt - tNumbered,
        totalMs: tBuilt - t0,
      },
    };
    if (run.keepThreads && workerCount > 0) {
      result.threads = workers;
      kept = workerCount;
    }
    return result;
  } finally {
    // Threads stop in the background (tearing one down takes tens of milliseconds that the caller need not wait for).
    for (const lane of lanes.slice(kept)) lane.close().catch(() => {});
    await reader.close();
  }
}

/** Build passes sliced across the parse workers (they hold no state the passes need: all arrays are shared). */
function laneRunner(lanes: Lane[]): PassRunner {
  return { slices: lanes.length, run: (tasks) => Promise.all(tasks.map((t, i) => lanes[i].runPass(t))) };
}

/** The least busy ready worker lane; the local lane (last) only while no worker is ready. */
function pickLane(lanes: Lane[], workers: number): number {
  let best = -1;
  for (let i = 0; i < workers; i++) if (lanes[i].ready && (best < 0 || lanes[i].inflight < lanes[best].inflight)) best = i;
  return best < 0 ? workers : best;
}

function countNewlines(buf: Uint8Array): number {
  let n = 0;
  for (let p = buf.indexOf(10); p >= 0; p = buf.indexOf(10, p + 1)) n++;
  return n;
}

type Counts = ParsedPart["counts"];

/** Sum the parts' counts and turn each part's local bad-line numbers into file line numbers. */
function reconcile(acks: ChunkAck[], partOf: number[], parts: ParsedPart[]) {
  const lineStart = new Float64Array(acks.length + 1);
  for (let s = 0; s < acks.length; s++) lineStart[s + 1] = lineStart[s] + (acks[s].linesAfter - acks[s].linesBefore);
  const byLane: ChunkAck[][] = parts.map(() => []);
  for (const a of acks) byLane[partOf[a.seq]].push(a);
  const badLines: BadLine[] = [];
  parts.forEach((part, k) => {
    for (const b of part.bad) {
      const a = byLane[k].find((x) => b.line > x.linesBefore && b.line <= x.linesAfter);
      if (a) badLines.push({ ...b, line: lineStart[a.seq] + (b.line - a.linesBefore) });
    }
  });
  badLines.sort((x, y) => x.line - y.line);
  badLines.length = Math.min(badLines.length, BAD_LINE_SAMPLES);
  const counts: Counts = {
    lines: 0,
    dataRows: 0,
    commentLines: 0,
    blankLines: 0,
    headerLines: 0,
    badLines: 0,
    selfLoops: 0,
    weightMin: Infinity,
    weightMax: -Infinity,
  };
  for (const p of parts) {
    const c = p.counts;
    counts.lines += c.lines;
    counts.dataRows += c.dataRows;
    counts.commentLines += c.commentLines;
    counts.blankLines += c.blankLines;
    counts.headerLines += c.headerLines;
    counts.badLines += c.badLines;
    counts.selfLoops += c.selfLoops;
    counts.weightMin = Math.min(counts.weightMin, c.weightMin);
    counts.weightMax = Math.max(counts.weightMax, c.weightMax);
  }
  return { badLines, counts };
}

function checkCounts(path: string, size: number, c: Counts, bad: BadLine[], maxBadLines: number): void {
  if (c.badLines > maxBadLines) {
    const first = bad[0];
    const count = c.badLines === 1 ? "1 bad line" : `${c.badLines} bad lines`;
    throw new IngestError(
      "too-many-bad-lines",
      path,
      `${path}: ${describeBadLine(first)}; ${count}, at most ${maxBadLines} allowed`,
      first,
      bad,
      c.badLines,
    );
  }
  if (c.dataRows > 0) return;
  if (size === 0) throw new IngestError("empty-file", path, `${path}: the file is empty`);
  if (c.headerLines > 0 && c.badLines === 0) throw new IngestError("header-only", path, `${path}: only a header row, no edges`);
  if (c.badLines === 0) throw new IngestError("no-data", path, `${path}: no edges (only comments or blank lines)`);
  throw new IngestError("no-edges", path, `${path}: no valid edge lines (${c.badLines} bad lines skipped)`, bad[0], bad, c.badLines);
}
