// CSV score files written with a thread pool at hand are the same bytes as those written without one (string ids go
// to the pool's threads; integer ids stay on the calling thread, in the score-text module, either way).
import { mkdtemp, readdir, readFile, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { NodeIds } from "../../workers/src/core/graph";
import { RankPool } from "../../workers/src/engine/rank";
import type { CsvRowPool } from "../../workers/src/output/csv-rows";
import { writeScores } from "../../workers/src/output/write-scores";
import { prng, stringIds } from "./rank-test-graphs";

let dir: string;
const pool = new RankPool({ threads: 2 });
beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "stillpoint-csv-pool-"));
});
afterAll(async () => {
  await pool.close();
  await rm(dir, { recursive: true, force: true });
});

const N = 150_000; // several pieces of rows per thread

function scores(seed: number): Float64Array {
  const rnd = prng(seed);
  const s = Float64Array.from({ length: N }, () => rnd() * (rnd() < 0.05 ? 1e-300 : 1));
  for (let i = 0; i < N; i += 97) s[i] = s[(i * 7) % N]; // ties
  s[3] = 0;
  return s;
}

/** The file written without a pool and with one, and how many pieces the pool's threads formatted. */
async function both(ids: NodeIds, s: Float64Array): Promise<[string, string, number]> {
  const here = join(dir, `here-${ids.kind}.csv`);
  const threads = join(dir, `threads-${ids.kind}.csv`);
  let pieces = 0;
  const counted: CsvRowPool = { threads: pool.threads, formatCsvRows: (task) => (pieces++, pool.formatCsvRows(task)) };
  await writeScores(here, "csv", ids, s, {});
  await writeScores(threads, "csv", ids, s, {}, { rowPool: counted });
  return [await readFile(here, "utf8"), await readFile(threads, "utf8"), pieces];
}

describe("CSV rows on pool threads", () => {
  it("stay on the calling thread for integer ids up to 2^64 - 1, with a pool at hand or not", async () => {
    const rnd = prng(3);
    const ids = new BigUint64Array(N);
    for (let i = 0; i < N; i++) ids[i] = i % 5 === 0 ? 2n ** 64n - 1n - BigInt(i) : BigInt(Math.floor(rnd() * 2 ** 53));
    const [here, threads, pieces] = await both({ kind: "integer", ids }, scores(1));
    expect(pieces).toBe(0);
    expect(threads).toBe(here);
    const lines = here.trimEnd().split("\n");
    expect(lines).toHaveLength(N + 1);
    expect(lines[0]).toBe("node_id,score,rank");
    expect(lines.some((l) => l.startsWith("18446744073709551615,"))).toBe(true);
    expect(lines[N].endsWith(`,${N}`)).toBe(true);
  });

  it("match for string ids that need quoting", async () => {
    const ids = stringIds(Array.from({ length: N }, (_, i) => (i % 11 === 0 ? `page "${i}", kestrel` : `isle-${i}-ø`)));
    const [here, threads, pieces] = await both(ids, scores(2));
    expect(pieces).toBeGreaterThan(0);
    expect(threads).toBe(here);
    expect(here).toContain('"page ""0"", kestrel",');
  });

  it("writes each score as its own shortest text, also in runs of equal scores (copied from the row before)", async () => {
    const s = scores(4);
    // Long runs of one score, a run of zeros and negative zeros, runs across piece boundaries.
    s.fill(0.25, 1000, 40_000);
    s.fill(-0, 50_000, 50_010);
    s.fill(0, 50_010, 50_020);
    s.fill(1 / 3, 100_000, 100_500);
    const ids = new BigUint64Array(N);
    for (let i = 0; i < N; i++) ids[i] = BigInt(i);
    const [here, threads] = await both({ kind: "integer", ids }, s);
    expect(threads).toBe(here);
    const rows = here.trimEnd().split("\n").slice(1);
    let checked = 0;
    for (const row of rows) {
      const [id, score] = row.split(",");
      expect(score).toBe(String(s[Number(id)]));
      checked++;
    }
    expect(checked).toBe(N);
  });

  it("fails whole when a thread's piece fails, while this thread is busy with its own: nothing half-written", async () => {
    // Pieces in flight fail while earlier ones are still being formatted and written here.
    const calls: number[] = [];
    const failing: CsvRowPool = {
      threads: 3,
      formatCsvRows: async (task) => {
        calls.push(task.from);
        // The first piece sent out takes a while; the next fails at once, long before its turn comes.
        if (calls.length === 1) await new Promise((r) => setTimeout(r, 30));
        throw new Error("a row thread stopped");
      },
    };
    const path = join(dir, "failing.csv");
    const ids = stringIds(Array.from({ length: N }, (_, i) => `skerry-${i}`));
    await expect(writeScores(path, "csv", ids, scores(5), {}, { rowPool: failing })).rejects.toThrow("a row thread stopped");
    expect(calls.length).toBeGreaterThanOrEqual(2);
    await expect(readFile(path)).rejects.toThrow();
    expect((await readdir(dir)).filter((f) => f.includes("failing"))).toEqual([]);
  });

  it("refuses string ids that are not UTF-8, naming nothing half-written", async () => {
    const bytes = Uint8Array.of(0x61, 0x62, 0xff, 0x63);
    const offsets = Uint32Array.of(0, 2, 4);
    const path = join(dir, "bad-ids.csv");
    await expect(writeScores(path, "csv", { kind: "string", bytes, offsets }, Float64Array.of(0.5, 0.5), {})).rejects.toThrow();
    await expect(readFile(path)).rejects.toThrow();
  });
});
