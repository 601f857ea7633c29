// The `stillpoint rank` command end to end, as a user runs it: JSON report, score file, seeds, exit codes.
import { execFile } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { TempFiles } from "../fixtures/edges/edge-files";
import { prng } from "./rank-test-graphs";

const ROOT = join(import.meta.dirname, "..", "..");
// The package's bin (a shell entry that sets glibc's huge-page tunable, then runs bin/stillpoint.mjs in-process).
const BIN = join(ROOT, "bin", "stillpoint");
const MJS = join(ROOT, "bin", "stillpoint.mjs");
const files = new TempFiles();
afterAll(() => files.remove());

interface Outcome {
  code: number;
  stdout: string;
  stderr: string;
}

function stillpoint(...args: string[]): Promise<Outcome> {
  return new Promise((resolve) => {
    execFile(BIN, args, { cwd: ROOT, timeout: 120_000 }, (err, stdout, stderr) => {
      const code = err ? (typeof err.code === "number" ? err.code : 1) : 0;
      resolve({ code, stdout, stderr });
    });
  });
}

// C. Moler, Numerical Computing with MATLAB (SIAM 2004), §2.11: six pages, page 5 dangling, p = 0.85.
const TINY_WEB = "1 2\n1 6\n2 3\n2 4\n3 4\n3 5\n3 6\n4 1\n6 1\n";
const TINY_WEB_SCORES: Record<string, number> = {
  "1": 0.32101694,
  "2": 0.17054304,
  "3": 0.10659163,
  "4": 0.13679259,
  "5": 0.0643118,
  "6": 0.200744,
};

describe("stillpoint rank", () => {
  it("prints one JSON object with counts, convergence, timings and memory", async () => {
    const r = await stillpoint("rank", files.write(TINY_WEB), "--json", "--top", "3", "--dangling", "uniform", "--threads", "1");
    expect(r.stderr).toBe("");
    expect(r.code).toBe(0);
    const lines = r.stdout.trim().split("\n");
    expect(lines).toHaveLength(1);
    const j = JSON.parse(lines[0]);
    expect(j).toMatchObject({ nodes: 6, edges: 9, converged: true, stopReason: "converged" });
    expect(j.iterations).toBeGreaterThan(10);
    expect(j.residual).toBeLessThan(1e-9);
    expect(j.errorBound).toBeCloseTo((0.85 / 0.15) * j.residual, 20);
    for (const k of ["parse", "build", "iterate", "perIteration", "perIterationMedian", "write", "total"]) expect(j.timings[k]).toBeGreaterThanOrEqual(0);
    expect(j.peakRssBytes).toBeGreaterThan(10 * 2 ** 20);
    expect(j.top.map((t: { id: string }) => t.id)).toEqual(["1", "6", "2"]);
    for (const t of j.top) expect(t.score).toBeCloseTo(TINY_WEB_SCORES[t.id], 7);
  });

  it("counts a repeated line with its multiplicity, merged or kept, and reports the merged edges", async () => {
    const repeated = `${TINY_WEB}1 2\n3 4\n3 4\n`;
    const run = async (...extra: string[]) => {
      const r = await stillpoint("rank", files.write(repeated), "--json", "--top", "6", "--tolerance", "1e-13", ...extra);
      expect(r.code, r.stderr).toBe(0);
      return JSON.parse(r.stdout) as { edges: number; ingest: { duplicates: number }; top: Array<{ id: string; score: number }> };
    };
    const merged = await run();
    const kept = await run("--keep-duplicates");
    expect(merged.edges).toBe(9);
    expect(merged.ingest.duplicates).toBe(3);
    expect(kept.edges).toBe(12);
    const scores = (j: typeof merged) => Object.fromEntries(j.top.map((t) => [t.id, t.score]));
    for (const [id, score] of Object.entries(scores(kept))) expect(scores(merged)[id]).toBeCloseTo(score, 12);
    // The repeats really weigh: node 2 gets more than it does without them.
    expect(scores(merged)["2"]).toBeGreaterThan(TINY_WEB_SCORES["2"] + 0.01);
  });

  it("runs the same without the start-up bundle (through the TypeScript loader) and when started as a plain script", async () => {
    const path = files.write(TINY_WEB);
    const bundled = await stillpoint("rank", path, "--json", "--threads", "1");
    const spawnWith = (cmd: string, args: string[], env: NodeJS.ProcessEnv) =>
      new Promise<Outcome>((resolve) => {
        execFile(cmd, args, { cwd: ROOT, env: { ...process.env, ...env } }, (err, stdout, stderr) => resolve({ code: err ? 1 : 0, stdout, stderr }));
      });
    const args = ["rank", path, "--json", "--threads", "1"];
    // Through tsx in-process; and `node bin/stillpoint.mjs`, which starts a second Node with the tunable set.
    const viaLoader = await spawnWith(BIN, args, { STILLPOINT_NO_BUNDLE: "1" });
    const viaScript = await spawnWith(process.execPath, [MJS, ...args], { GLIBC_TUNABLES: "" });
    const strip = (o: Outcome) => {
      const j = JSON.parse(o.stdout);
      return { ...j, timings: null, peakRssBytes: null, ingest: { ...j.ingest, parseMBps: null } };
    };
    for (const other of [viaLoader, viaScript]) {
      expect(other.code, other.stderr).toBe(0);
      expect(strip(other)).toEqual(strip(bundled));
    }
  });

  it("writes the scores of a small, dense graph big enough for a shared heap (too little run space to borrow)", async () => {
    // 100 nodes, 2.2M lines kept apart: 8.8 MB of graph arrays, so a heap, whose run space is only a few KB.
    // No self-loops, so exactly 2.2M arcs: the heap then has 46 KB free, less than the rank order's arrays need.
    const rnd = prng(9);
    const lines = Array.from({ length: 2_200_000 }, () => {
      const u = Math.floor(rnd() * 100);
      return `${u} ${(u + 1 + Math.floor(rnd() * 99)) % 100}`;
    });
    const out = files.path("dense.csv");
    const r = await stillpoint("rank", files.write(`${lines.join("\n")}\n`), "--keep-duplicates", "--out", out, "--json", "--top", "3");
    expect(r.code, r.stderr).toBe(0);
    const rows = readFileSync(out, "utf8").trim().split("\n");
    expect(rows).toHaveLength(101);
    expect(rows[1].split(",")[0]).toBe(JSON.parse(r.stdout).top[0].id);
  });

  it("runs on the threads that parsed a big file and writes the same bytes as one thread", { timeout: 120_000 }, async () => {
    // Over 16 MiB, so two parse threads start; the run's steps and the string ids' CSV rows then go to those threads.
    const rnd = prng(17);
    const lines = Array.from({ length: 1_300_000 }, () => `harbour-${Math.floor(rnd() ** 3 * 90_000)}\tquay-${Math.floor(rnd() * 90_000)}`);
    const path = files.write(`${lines.join("\n")}\n`);
    const two = files.path("two.csv");
    const one = files.path("one.csv");
    const a = await stillpoint("rank", path, "--threads", "2", "--out", two, "--json", "--top", "0");
    expect(a.code, a.stderr).toBe(0);
    expect(JSON.parse(a.stdout).ingest.parseThreads).toBe(2);
    const b = await stillpoint("rank", path, "--threads", "1", "--out", one, "--json", "--top", "0");
    expect(b.code, b.stderr).toBe(0);
    expect(JSON.parse(b.stdout).ingest.parseThreads).toBe(1);
    const rows = readFileSync(two, "utf8");
    expect(rows).toBe(readFileSync(one, "utf8"));
    expect(rows.split("\n").length).toBeGreaterThan(100_000);
  });

  it("writes every node's score to a CSV file in rank order", async () => {
    const out = files.path("scores.csv");
    const r = await stillpoint("rank", files.write(TINY_WEB), "--out", out, "--dangling", "uniform");
    expect(r.code).toBe(0);
    expect(r.stdout).toMatch(/converged after \d+ iterations/);
    expect(r.stdout).toContain(`scores written to ${out}`);
    const rows = readFileSync(out, "utf8").trim().split("\n");
    expect(rows[0]).toBe("node_id,score,rank");
    const body = rows.slice(1).map((l) => l.split(","));
    expect(body).toHaveLength(6);
    expect(body.map((c) => c[2])).toEqual(["1", "2", "3", "4", "5", "6"]);
    expect(body.map((c) => c[0])).toEqual(["1", "6", "2", "4", "3", "5"]);
    for (const [id, score] of body) expect(Number(score)).toBeCloseTo(TINY_WEB_SCORES[id], 7);
    expect(body.reduce((s, c) => s + Number(c[1]), 0)).toBeCloseTo(1, 12);
  });

  it("exits with 2 and names the file, the line and the reason for bad input", async () => {
    const path = files.write("# Kestrel harbour links\n1,2\n2,3,x,y\n3,1\n");
    const r = await stillpoint("rank", path, "--json");
    expect(r.code).toBe(2);
    expect(r.stdout).toBe("");
    expect(r.stderr).toContain(path);
    expect(r.stderr).toContain("line 3");
    expect(r.stderr).toContain("wrong number of columns");
    const skipped = await stillpoint("rank", path, "--json", "--max-bad-lines", "1");
    expect(skipped.code).toBe(0);
    expect(JSON.parse(skipped.stdout).ingest.badLines).toBe(1);
  });

  it("exits with 2 for a missing file, an unknown output format and invalid options", async () => {
    expect((await stillpoint("rank", files.path("absent.tsv"))).code).toBe(2);
    const fmt = await stillpoint("rank", files.write(TINY_WEB), "--out", files.path("scores.xlsx"));
    expect(fmt.code).toBe(2);
    expect(fmt.stderr).toMatch(/--out must end in \.csv, \.arrow or \.parquet/);
    expect((await stillpoint("rank", files.write(TINY_WEB), "--damping", "1.5")).code).toBe(2);
  });

  it("teleports to seeds and lists seed ids the graph does not have", async () => {
    // Single edge 1→2 with all teleport on node 2: dangling mass follows the teleport vector → scores (0, 1).
    const edge = files.write("1 2\n");
    const seeds = files.write("# trusted harbour office\n2,1\n1,0\n");
    const r = await stillpoint("rank", edge, "--seeds", seeds, "--json", "--top", "2");
    expect(r.code).toBe(0);
    const top = JSON.parse(r.stdout).top;
    expect(top[0]).toMatchObject({ id: "2" });
    expect(top[0].score).toBeCloseTo(1, 12);
    const uniform = JSON.parse((await stillpoint("rank", edge, "--seeds", seeds, "--dangling", "uniform", "--json")).stdout).top;
    expect(uniform[0].score).toBeCloseTo(40 / 57, 9);
    const unknown = await stillpoint("rank", edge, "--seeds", files.write("2\n77\nferry-office,2\n"));
    expect(unknown.code).toBe(2);
    expect(unknown.stderr).toMatch(/2 seed ids are not in the graph: "77" \(line 2\), "ferry-office" \(line 3\)/);
  });
});
