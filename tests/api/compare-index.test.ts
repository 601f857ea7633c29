// Comparing two runs from their score indexes gives exactly what comparing their score files gives.
import { mkdtemp, rm } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { compareIndexes } from "../../api/src/features/compare/compare-index";
import { compareColumns, type ScoreColumns } from "../../api/src/features/compare/compare.service";
import { averageRanks, kendallTauB, spearmanRho } from "../../api/src/features/compare/rank-correlation";
import type { NodeIds } from "../../workers/src/core/graph";
import { mulberry32 as prng } from "../../workers/src/core/prng";
import { rankOrder } from "../../workers/src/output/rank-order";
import { ScoreIndex } from "../../workers/src/score-index/read";
import { writeScoreIndex } from "../../workers/src/score-index/write";

let dir: string;
let fileNo = 0;

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "stillpoint-compare-index-"));
});
afterAll(() => rm(dir, { recursive: true, force: true }));

interface Run {
  ids: NodeIds;
  text: string[];
  scores: Float64Array;
}

const encoder = new TextEncoder();

function stringRun(text: string[], scores: Float64Array): Run {
  const parts = text.map((s) => encoder.encode(s));
  const offsets = new Uint32Array(parts.length + 1);
  parts.forEach((p, i) => (offsets[i + 1] = offsets[i] + p.length));
  const bytes = new Uint8Array(offsets[parts.length]);
  parts.forEach((p, i) => bytes.set(p, offsets[i]));
  return { ids: { kind: "string", bytes, offsets }, text, scores };
}

function integerRun(values: bigint[], scores: Float64Array): Run {
  return { ids: { kind: "integer", ids: BigUint64Array.from(values) }, text: values.map(String), scores };
}

/** The run as its score file reads: ids and scores in rank order. */
function columns(run: Run): ScoreColumns {
  const order = rankOrder(run.scores);
  return { ids: Array.from(order, (v) => run.text[v]), scores: Float64Array.from(order, (v) => run.scores[v]) };
}

async function indexOf(run: Run): Promise<ScoreIndex> {
  const file = join(dir, `run-${fileNo++}.index`);
  await writeScoreIndex(file, { ids: run.ids, scores: run.scores });
  return ScoreIndex.open(file);
}

/** Scores with many ties (few levels) so tie handling in every statistic is exercised. */
function scores(n: number, levels: number, seed: number): Float64Array {
  const rnd = prng(seed);
  return Float64Array.from({ length: n }, () => Math.floor(rnd() * levels) / levels + (rnd() < 0.02 ? 0.5 : 0));
}

const pages = (from: number, to: number) => Array.from({ length: to - from }, (_, i) => `https://harbour.kestrel.example/tides/${from + i}`);

async function expectSameAsColumns(a: Run, b: Run, k: number, limit: number): Promise<void> {
  const [ia, ib] = await Promise.all([indexOf(a), indexOf(b)]);
  try {
    const fromIndex = await compareIndexes(ia, ib, k, limit);
    const fromColumns = compareColumns(columns(a), columns(b), k, limit);
    expect(fromIndex).toEqual(fromColumns);
    // bit for bit, not merely close
    expect(Object.is(fromIndex.kendallTau, fromColumns.kendallTau)).toBe(true);
    expect(Object.is(fromIndex.spearmanRho, fromColumns.spearmanRho)).toBe(true);
    expect(Object.is(fromIndex.rbo.value, fromColumns.rbo.value)).toBe(true);
  } finally {
    await Promise.all([ia.close(), ib.close()]);
  }
}

describe("compare from score indexes", () => {
  it("matches the score-file comparison on one node set (no id pass)", async () => {
    const text = pages(0, 20_000);
    await expectSameAsColumns(stringRun(text, scores(20_000, 300, 1)), stringRun(text, scores(20_000, 50_000, 2)), 100, 20);
  });

  it("matches it when a run is compared with itself", async () => {
    const run = stringRun(pages(0, 5000), scores(5000, 40, 3));
    await expectSameAsColumns(run, run, 40, 5);
  });

  it("matches it across graphs with string ids (movers, one-sided nodes, k past the smaller run)", async () => {
    const a = stringRun([...pages(0, 150_000), "museum,\"quoted\"", "ferry-ÿ"], scores(150_002, 1000, 4));
    const b = stringRun([...pages(90_000, 160_000), "ferry-ÿ"], scores(70_001, 1000, 5));
    await expectSameAsColumns(a, b, 100, 20);
    await expectSameAsColumns(b, a, 100_000, 200);
  });

  it("matches it across graphs with integer ids above 2^53", async () => {
    const base = 2n ** 60n;
    const a = integerRun(Array.from({ length: 30_000 }, (_, i) => base + BigInt(i * 3)), scores(30_000, 200, 6));
    const b = integerRun(Array.from({ length: 30_000 }, (_, i) => base + BigInt(i * 2)), scores(30_000, 200, 7));
    await expectSameAsColumns(a, b, 500, 50);
  });

  it("matches it between an integer-id run and a string-id run", async () => {
    const a = integerRun(Array.from({ length: 4000 }, (_, i) => BigInt(i)), scores(4000, 100, 8));
    const text = [...Array.from({ length: 3000 }, (_, i) => String(i * 2)), "007", "harbour", "18446744073709551616"];
    const b = stringRun(text, scores(text.length, 100, 9));
    await expectSameAsColumns(a, b, 100, 20);
    await expectSameAsColumns(b, a, 100, 20);
  });

  it("matches it for disjoint and tiny runs", async () => {
    await expectSameAsColumns(stringRun(["ferry"], Float64Array.of(1)), stringRun(["harbour"], Float64Array.of(1)), 10, 5);
    await expectSameAsColumns(stringRun([], new Float64Array(0)), stringRun(["harbour"], Float64Array.of(1)), 10, 5);
    await expectSameAsColumns(stringRun(["a", "b"], Float64Array.of(0.5, 0.5)), stringRun(["b", "a"], Float64Array.of(0.5, 0.5)), 1, 1);
  });
});

/** The (x, y) order and average ranks as the first version computed them, with comparison sorts. */
function comparatorKendall(x: Float64Array, y: Float64Array): number | null {
  const n = x.length;
  if (n < 2) return null;
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => x[i] - x[j] || y[i] - y[j]);
  const xs = Float64Array.from(order, (i) => x[i]);
  const ys = Float64Array.from(order, (i) => y[i]);
  let n1 = 0;
  let n2 = 0;
  let n3 = 0;
  let swaps = 0;
  const tied = (v: Float64Array) => {
    let total = 0;
    let run = 1;
    for (let i = 1; i <= n; i++) {
      if (i < n && v[i] === v[i - 1]) run++;
      else {
        total += (run * (run - 1)) / 2;
        run = 1;
      }
    }
    return total;
  };
  n1 = tied(xs);
  let run = 1;
  for (let i = 1; i <= n; i++) {
    if (i < n && xs[i] === xs[i - 1] && ys[i] === ys[i - 1]) run++;
    else {
      n3 += (run * (run - 1)) / 2;
      run = 1;
    }
  }
  // discordant pairs by brute force over the sorted sequence
  for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) if (ys[i] > ys[j]) swaps++;
  n2 = tied(Float64Array.from(ys).sort());
  const n0 = (n * (n - 1)) / 2;
  const denominator = Math.sqrt((n0 - n1) * (n0 - n2));
  return denominator === 0 ? null : (n0 - n1 - n2 + n3 - 2 * swaps) / denominator;
}

function comparatorAverageRanks(v: Float64Array): Float64Array {
  const n = v.length;
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => v[i] - v[j]);
  const ranks = new Float64Array(n);
  let i = 0;
  while (i < n) {
    let j = i;
    while (j + 1 < n && v[order[j + 1]] === v[order[i]]) j++;
    for (let k = i; k <= j; k++) ranks[order[k]] = (i + j) / 2 + 1;
    i = j + 1;
  }
  return ranks;
}

describe("rank statistics over radix order", () => {
  it.each([
    [2, 2, 1],
    [300, 3, 2],
    [1500, 40, 3],
    [2000, 1_000_000, 4],
  ])("equal the comparison-sort computation bit for bit (n = %i, %i levels)", (n, levels, seed) => {
    const x = scores(n, levels, seed);
    const y = scores(n, levels, seed * 31);
    for (let i = 0; i < n; i += 4) y[i] = x[i];
    x[0] = -0;
    y[1] = -0;
    expect(Object.is(kendallTauB(x, y), comparatorKendall(x, y))).toBe(true);
    expect(averageRanks(x)).toEqual(comparatorAverageRanks(x));
    expect(averageRanks(y)).toEqual(comparatorAverageRanks(y));
    expect(spearmanRho(x, y)).not.toBeNull();
  });
});
