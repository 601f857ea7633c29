// End-to-end benchmark of `stillpoint rank` on R-MAT graphs, against the plain C reference when it can be built.
//   npm run bench -- [--scales 16,18,20] [--runs 3] [--threads N] [--no-reference]
// Per scale: our CLI with --keep-self-loops --json --out scores.csv (text in, CSV score file out) and the reference on
// the same cached text file, runs alternating, medians reported. The reference writes no score file. The reference counts duplicate edges with their multiplicity, which is the transition matrix our
// default merging gives (weights = multiplicities). Writes a JSON report to bench/results/.

import { execFile, spawnSync } from "node:child_process";
import { existsSync, mkdirSync, statSync, writeFileSync } from "node:fs";
import { availableParallelism, tmpdir } from "node:os";
import { basename, dirname, join } from "node:path";
import { rmatFile } from "./rmat";

const ROOT = join(import.meta.dirname, "..");
const BIN = join(ROOT, "bin", "stillpoint");

interface Args {
  scales: number[];
  runs: number;
  threads: number;
  reference: boolean;
}

function parseArgs(argv: string[]): Args {
  const args: Args = { scales: [16, 18, 20], runs: 3, threads: availableParallelism(), reference: true };
  for (let i = 0; i < argv.length; i++) {
    const next = () => {
      const v = argv[++i];
      if (v === undefined) throw new Error(`${argv[i - 1]} needs a value`);
      return v;
    };
    if (argv[i] === "--scales") args.scales = next().split(",").map(Number);
    else if (argv[i] === "--runs") args.runs = Number(next());
    else if (argv[i] === "--threads") args.threads = Number(next());
    else if (argv[i] === "--no-reference") args.reference = false;
    else throw new Error(`unknown argument ${argv[i]}`);
  }
  if (args.scales.some((s) => !Number.isInteger(s) || s < 2 || s > 30)) throw new Error("--scales must be integers in 2..30");
  if (!Number.isInteger(args.runs) || args.runs < 1) throw new Error("--runs must be a positive integer");
  return args;
}

interface Timed<T> {
  wallMs: number;
  value: T;
}

function run(cmd: string, argv: string[]): Promise<Timed<string>> {
  const t = performance.now();
  return new Promise((resolve, reject) => {
    execFile(cmd, argv, { cwd: ROOT, maxBuffer: 1 << 26 }, (err, stdout, stderr) => {
      if (err) reject(new Error(`${cmd} ${argv.join(" ")} failed: ${stderr || err.message}`));
      else resolve({ wallMs: performance.now() - t, value: stdout });
    });
  });
}

interface Ours {
  wallMs: number;
  parseMs: number;
  buildMs: number;
  /** Median over the iterations of a run, as the reference reports; the mean includes the first, page-faulting one. */
  perIterationMs: number;
  meanIterationMs: number;
  iterations: number;
  writeMs: number;
  totalMs: number;
  peakRssBytes: number;
  parseMBps: number;
  nodes: number;
  edges: number;
  graphBytes: number;
  threads: number;
  converged: boolean;
}

async function runOurs(file: string, threads: number): Promise<Ours> {
  const out = join(dirname(file), `scores-${basename(file, ".tsv")}.csv`);
  const r = await run(BIN, ["rank", file, "--keep-self-loops", "--json", "--top", "0", "--threads", String(threads), "--out", out]);
  const j = JSON.parse(r.value);
  return {
    wallMs: r.wallMs,
    parseMs: j.timings.parse,
    buildMs: j.timings.build,
    perIterationMs: j.timings.perIterationMedian,
    meanIterationMs: j.timings.perIteration,
    iterations: j.iterations,
    writeMs: j.timings.write,
    totalMs: j.timings.total,
    peakRssBytes: j.peakRssBytes,
    parseMBps: j.ingest.parseMBps,
    nodes: j.nodes,
    edges: j.edges,
    graphBytes: j.graphBytes,
    threads: j.threads,
    converged: j.converged,
  };
}

interface Reference {
  wallMs: number;
  parseMs: number;
  buildMs: number;
  perIterationMs: number;
  iterations: number;
  totalMs: number;
  peakRssBytes: number;
  parseMBps: number;
}

async function runReference(binary: string, file: string, threads: number): Promise<Reference> {
  const r = await run(binary, ["-t", String(threads), "-e", "1e-9", "-i", "200", file]);
  const num = (key: string) => {
    const m = new RegExp(`${key}=([0-9.eE+-]+)`).exec(r.value);
    if (!m) throw new Error(`reference output lacks ${key}`);
    return Number(m[1]);
  };
  return {
    wallMs: r.wallMs,
    parseMs: num("parse_s") * 1000,
    buildMs: num("build_s") * 1000,
    perIterationMs: num("iter_s_median") * 1000,
    iterations: num("iterations"),
    totalMs: num("total_s") * 1000,
    peakRssBytes: num("maxrss_MiB") * 2 ** 20,
    parseMBps: num("parse_MBps"),
  };
}

/** The reference binary, built with make when gcc is present; null when unavailable. */
function referenceBinary(): string | null {
  const build = join(tmpdir(), "yardstick-build");
  const binary = join(build, "pr_ref");
  if (existsSync(binary)) return binary;
  const source = process.env.STILLPOINT_YARDSTICK ?? join(ROOT, "..", "shared", "yardstick");
  if (!existsSync(join(source, "Makefile"))) return null;
  if (spawnSync("gcc", ["--version"]).status !== 0) return null;
  const made = spawnSync("make", ["-C", source, `BUILD=${build}`], { stdio: "inherit" });
  return made.status === 0 && existsSync(binary) ? binary : null;
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid] : (s[mid - 1] + s[mid]) / 2;
}

function medians<T extends object>(rows: T[]): T {
  const out: Record<string, unknown> = {};
  for (const key of Object.keys(rows[0])) {
    const vals = rows.map((r) => (r as Record<string, unknown>)[key]);
    out[key] = typeof vals[0] === "number" ? median(vals as number[]) : vals[0];
  }
  return out as T;
}

const fmt = (v: number, digits = 1) => (Number.isFinite(v) ? v.toFixed(digits) : "-");
const mib = (b: number) => `${fmt(b / 2 ** 20, 0)} MiB`;

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  const reference = args.reference ? referenceBinary() : null;
  console.log(`stillpoint rank benchmark: R-MAT scales ${args.scales.join(", ")}, ${args.runs} runs each, ${args.threads} threads`);
  console.log(reference ? `C reference: ${reference}` : "C reference: not available (ratios omitted)");
  const results = [];
  for (const scale of args.scales) {
    const tGen = performance.now();
    const file = await rmatFile(scale);
    const bytes = statSync(file).size;
    const genMs = performance.now() - tGen;
    const ours: Ours[] = [];
    const refs: Reference[] = [];
    for (let r = 0; r < args.runs; r++) {
      ours.push(await runOurs(file, args.threads));
      if (reference) refs.push(await runReference(reference, file, args.threads));
    }
    const o = medians(ours);
    const c = refs.length > 0 ? medians(refs) : null;
    const row = {
      scale,
      file,
      bytes,
      generateMs: genMs,
      nodes: o.nodes,
      edges: o.edges,
      ours: o,
      reference: c,
      bytesPerEdge: o.graphBytes / o.edges,
      peakRssPerGraphByte: o.peakRssBytes / o.graphBytes,
      edgesPerSecondPerIteration: o.edges / (o.perIterationMs / 1000),
      ratios: c
        ? {
            perIteration: o.perIterationMs / c.perIterationMs,
            endToEndWall: o.wallMs / c.wallMs,
            peakRss: o.peakRssBytes / c.peakRssBytes,
            parse: o.parseMs / c.parseMs,
          }
        : null,
    };
    results.push(row);
    console.log(`\nscale ${scale}: ${o.nodes} nodes, ${o.edges} edges after merging, ${mib(bytes)} of text`);
    console.log(`  startup     ${fmt(o.wallMs - o.totalMs, 0)} ms (wall time outside the command's own timings)`);
    console.log(`  parse       ${fmt(o.parseMBps, 0)} MB/s (${fmt(o.parseMs, 0)} ms)${c ? `   reference ${fmt(c.parseMBps, 0)} MB/s (${fmt(c.parseMs, 0)} ms)` : ""}`);
    console.log(`  build       ${fmt(o.buildMs, 0)} ms${c ? `   reference ${fmt(c.buildMs, 0)} ms` : ""}`);
    console.log(
      `  iteration   ${fmt(o.perIterationMs, 2)} ms median (mean ${fmt(o.meanIterationMs, 2)}) × ${o.iterations} to 1e-9 (${o.converged ? "converged" : "NOT converged"})` +
        `${c ? `   reference ${fmt(c.perIterationMs, 2)} ms median × ${c.iterations}` : ""}`,
    );
    console.log(`  write       ${fmt(o.writeMs, 0)} ms (CSV score file, ${o.nodes} rows)`);
    console.log(`  throughput  ${fmt(row.edgesPerSecondPerIteration / 1e6, 0)} M edges/s per iteration, ${o.threads} threads`);
    console.log(`  graph       ${fmt(row.bytesPerEdge, 2)} bytes per edge prepared (${mib(o.graphBytes)}); peak RSS ${fmt(row.peakRssPerGraphByte, 2)}× that`);
    console.log(`  peak RSS    ${mib(o.peakRssBytes)}${c ? `   reference ${mib(c.peakRssBytes)}` : ""}`);
    console.log(`  wall        ${fmt(o.wallMs, 0)} ms end to end${c ? `   reference ${fmt(c.wallMs, 0)} ms` : ""}`);
    if (row.ratios) {
      const r = row.ratios;
      console.log(`  vs C        per iteration ${fmt(r.perIteration, 2)}×, end to end ${fmt(r.endToEndWall, 2)}×, peak RSS ${fmt(r.peakRss, 2)}×, parse ${fmt(r.parse, 2)}×`);
    }
  }
  const dir = join(ROOT, "bench", "results");
  mkdirSync(dir, { recursive: true });
  const out = join(dir, `rank-${new Date().toISOString().replace(/[:.]/g, "-")}.json`);
  writeFileSync(out, `${JSON.stringify({ when: new Date().toISOString(), args, node: process.version, results }, null, 2)}\n`);
  console.log(`\nreport: ${out}`);
}

await main();
