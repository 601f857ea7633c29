// Retry, fault injection, cancellation, checkpoints and resume: every path ends with the same bits.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BLOCK_NODES } from "../../workers/src/core/graph";
import { LanePool } from "../../workers/src/engine/lane-pool";
import { rank, RankPool, type FaultPlan, type IterationProgress, type RankParams, type ShardPool } from "../../workers/src/engine/rank";
import { WorkerLane } from "../../workers/src/ingest/lanes";
import { applyPolicies, PARAMS, randomEdges, sameBits, toGraph } from "./rank-test-graphs";

let pool: RankPool;
// The command line's pool: the threads its ingest parsed on, which must retry, replace and recover the same way.
let lanePool: LanePool;
beforeAll(() => {
  pool = new RankPool({ threads: 2 });
  lanePool = new LanePool([new WorkerLane(), new WorkerLane()]);
});
afterAll(() => Promise.all([pool.close(), lanePool.close()]));

const g = toGraph(applyPolicies(randomEdges(99, 5 * BLOCK_NODES, 4), true));
const params: RankParams = { ...PARAMS, weighted: true, shards: 3 };
const retry = { attempts: 3, backoffMs: 5, taskTimeoutMs: 1500 };
let clean: Awaited<ReturnType<typeof rank>>;
beforeAll(async () => {
  clean = await rank(g, params, { pool });
});

describe("retries", () => {
  const cases: [string, FaultPlan[]][] = [
    ["a task that throws", [{ shard: 1, iteration: 2, attempt: 1, kind: "throw" }]],
    ["a worker that exits mid-task", [{ shard: 0, iteration: 4, attempt: 1, kind: "exit-worker" }]],
    ["a task that hangs past its deadline", [{ shard: 2, iteration: 3, attempt: 1, kind: "hang" }]],
    [
      "several faults on the same shard and iteration",
      [
        { shard: 2, iteration: 5, attempt: 1, kind: "throw" },
        { shard: 2, iteration: 5, attempt: 2, kind: "exit-worker" },
      ],
    ],
  ];
  for (const [name, faults] of cases) for (const kind of ["thread pool", "lane pool"]) {
    it(`${name} is retried and the scores keep their bits (${kind})`, { timeout: 120_000 }, async () => {
      const seen: IterationProgress[] = [];
      const on: ShardPool = kind === "thread pool" ? pool : lanePool;
      const r = await rank(g, params, { pool: on, retry, faults, onIteration: (p) => void seen.push(p) });
      expect(r.stopReason).toBe("converged");
      expect(sameBits(r.scores, clean.scores)).toBe(true);
      expect(r.residuals).toEqual(clean.residuals);
      const f = faults[faults.length - 1];
      const st = seen.find((p) => p.k === f.iteration)?.shards[f.shard];
      expect(st).toMatchObject({ state: "done", attempts: f.attempt + 1 });
      expect(st?.lastError).toBeTruthy();
      expect(seen.find((p) => p.k === f.iteration + 1)?.shards[f.shard]).toMatchObject({ attempts: 1 });
      // Three shards on two threads: a thread's fault costs no other shard an attempt (none waits on a dying thread).
      const others = (seen.find((p) => p.k === f.iteration)?.shards ?? []).filter((_, j) => !faults.some((x) => x.shard === j && x.iteration === f.iteration));
      expect(others).toHaveLength(2);
      for (const other of others) expect(other.attempts).toBe(1);
      // The pool is whole again: a clean run after the fault.
      expect(on.stats()).toEqual({ threads: 2, busy: 0 });
      expect(sameBits((await rank(g, params, { pool: on })).scores, clean.scores)).toBe(true);
    });
  }

  it("a lane pool replaces a thread that stopped while idle instead of waiting on it", { timeout: 20_000 }, async () => {
    const idle = new WorkerLane();
    await idle.close();
    expect(idle.alive).toBe(false);
    const lanes = new LanePool([idle, new WorkerLane()]);
    try {
      const r = await rank(g, params, { pool: lanes, retry: { ...retry, taskTimeoutMs: 60_000 } });
      expect(sameBits(r.scores, clean.scores)).toBe(true);
    } finally {
      await lanes.close();
    }
  });

  it("past the attempt limit the run needs attention and keeps the last good iterate", { timeout: 120_000 }, async () => {
    const faults: FaultPlan[] = [1, 2, 3].map((attempt) => ({ shard: 1, iteration: 4, attempt, kind: "throw" }));
    const r = await rank(g, params, { pool, retry, faults });
    expect(r.stopReason).toBe("needs-attention");
    expect(r.converged).toBe(false);
    expect(r.failure).toEqual({ shard: 1, attempts: 3, lastError: "injected fault: task threw" });
    expect(r.iterations).toBe(3);
    const three = await rank(g, { ...params, maxIterations: 3 }, { pool });
    expect(sameBits(r.scores, three.scores)).toBe(true);
  });
});

describe("deadlines", () => {
  it("count running time only: tasks queued behind a booting worker are not retried", { timeout: 120_000 }, async () => {
    const fresh = new RankPool({ threads: 1 });
    try {
      const seen: IterationProgress[] = [];
      const r = await rank(g, { ...params, shards: 3 }, {
        pool: fresh,
        retry: { attempts: 1, backoffMs: 1, taskTimeoutMs: 500 },
        onIteration: (p) => void seen.push(p),
      });
      expect(r.stopReason).toBe("converged");
      expect(seen[0].shards.map((st) => st.attempts)).toEqual([1, 1, 1]);
      expect(sameBits(r.scores, clean.scores)).toBe(true);
    } finally {
      await fresh.close();
    }
  });
});

describe("cancel, checkpoints and resume", () => {
  it("an aborted signal stops the run as canceled with the last complete iterate", async () => {
    const ac = new AbortController();
    const r = await rank(g, params, { pool, signal: ac.signal, onIteration: (p) => (p.k === 3 ? ac.abort() : undefined) });
    expect(r.stopReason).toBe("canceled");
    expect(r.iterations).toBe(3);
    const three = await rank(g, { ...params, maxIterations: 3 }, { pool });
    expect(sameBits(r.scores, three.scores)).toBe(true);
  });

  // The deadline (60 s) is past the test timeout: only an abort of the running task lets this finish.
  it("canceling during a hung task aborts it instead of waiting for its deadline", { timeout: 50_000 }, async () => {
    const ac = new AbortController();
    const faults: FaultPlan[] = [{ shard: 0, iteration: 2, attempt: 1, kind: "hang" }];
    setTimeout(() => ac.abort(), 300);
    const r = await rank(g, params, { pool, signal: ac.signal, faults, retry: { ...retry, taskTimeoutMs: 60_000 } });
    expect(r.stopReason).toBe("canceled");
    expect(r.iterations).toBe(1);
  });

  it("resuming from a checkpoint gives the same final bits and continues the numbering", async () => {
    const saved = new Map<number, Float64Array>();
    const full = await rank(g, params, { pool, checkpointEvery: 4, onCheckpoint: (k, x) => void saved.set(k, x) });
    expect([...saved.keys()]).toEqual(Array.from({ length: Math.floor(full.iterations / 4) }, (_, i) => 4 * (i + 1)));
    const x8 = saved.get(8) as Float64Array;
    const ks: number[] = [];
    const resumed = await rank(g, params, { pool, resumeFrom: { k: 8, x: x8 }, onIteration: (p) => void ks.push(p.k) });
    expect(ks[0]).toBe(9);
    expect(resumed.iterations).toBe(full.iterations);
    expect(resumed.residuals).toEqual(full.residuals.slice(8));
    expect(sameBits(resumed.scores, full.scores)).toBe(true);
  });

  it("maxIterations counts from the start of the run, not from the resume point", async () => {
    const first = await rank(g, { ...params, maxIterations: 6 }, { pool });
    const resumed = await rank(g, { ...params, maxIterations: 10 }, { pool, resumeFrom: { k: 6, x: first.scores } });
    const ten = await rank(g, { ...params, maxIterations: 10 }, { pool });
    expect(resumed.iterations).toBe(10);
    expect(sameBits(resumed.scores, ten.scores)).toBe(true);
  });
});

describe("loud failures", () => {
  it("mass leaking through a wrong out-weight stops the run as failed", async () => {
    const bad = { ...g, outWeight: g.outWeight.map((w) => (w > 0 ? w * 1.5 : 0)) };
    const r = await rank(bad, params, { pool });
    expect(r.stopReason).toBe("failed");
    expect(r.failure?.lastError).toMatch(/mass drifted/);
    expect(r.iterations).toBe(0);
  });

  it("rejects bad parameters naming the value", async () => {
    await expect(rank(g, { ...params, damping: 1 }, { pool })).rejects.toThrow(/damping .*Value: 1/);
    await expect(rank(g, { ...params, shards: 0 }, { pool })).rejects.toThrow(/shards/);
    await expect(
      rank(g, { ...params, teleport: { kind: "seeds", seeds: [{ node: g.n, weight: 1 }] } }, { pool }),
    ).rejects.toThrow(/seeds\[0\]\.node/);
    await expect(rank(g, params, { pool, resumeFrom: { k: 1, x: new Float64Array(3) } })).rejects.toThrow(/resumeFrom/);
  });
});
