// The score index: round trips, id order, lookups, the Arrow rebuild and joins between two indexes.
import { mkdtemp, readdir, readFile, rm, writeFile } from "node:fs/promises";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { NodeIds } from "../../workers/src/core/graph";
import { rankOrder, ranks } from "../../workers/src/output/rank-order";
import { writeScores } from "../../workers/src/output/write-scores";
import { ScoreIndexFormatError } from "../../workers/src/score-index/format";
import { scoreIndexFromArrow } from "../../workers/src/score-index/from-arrow";
import { logHistogram } from "../../workers/src/score-index/histogram";
import { sortedIdOrder } from "../../workers/src/score-index/id-order";
import { matchSlots } from "../../workers/src/score-index/join";
import { blockIdText, ScoreIndex } from "../../workers/src/score-index/read";
import { writeScoreIndex } from "../../workers/src/score-index/write";
import { prng, stringIds } from "./rank-test-graphs";

let dir: string;
let fileNo = 0;
const nextFile = () => join(dir, `index-${fileNo++}.index`);

beforeAll(async () => {
  dir = await mkdtemp(join(tmpdir(), "stillpoint-score-index-"));
});
afterAll(() => rm(dir, { recursive: true, force: true }));



/** Scores with ties and a few exact zeros, summing to about 1. */
function scoresFor(n: number, seed: number): Float64Array {
  const rnd = prng(seed);
  const levels = Math.max(2, Math.floor(n / 4));
  const raw = Float64Array.from({ length: n }, () => (rnd() < 0.03 ? 0 : (1 + Math.floor(rnd() * levels)) * rnd() ** 3));
  const sum = raw.reduce((s, v) => s + v, 0);
  return raw.map((v) => v / sum);
}

/** Distinct unsigned 64-bit ids across the whole range, including 0, 2^53 ± 1 and 2^64 − 1. */
function bigIds(n: number, seed: number): BigUint64Array {
  const rnd = prng(seed);
  const seen = new Set<bigint>([0n, 2n ** 53n - 1n, 2n ** 53n + 1n, 2n ** 64n - 1n]);
  while (seen.size < n) {
    const hi = BigInt(Math.floor(rnd() * 2 ** 32));
    const lo = BigInt(Math.floor(rnd() * 2 ** 32));
    seen.add(rnd() < 0.3 ? lo : (hi << 32n) | lo);
  }
  const out = BigUint64Array.from([...seen].slice(0, n));
  // shuffle so the dense order is not the sorted one
  for (let i = n - 1; i > 0; i--) {
    const j = Math.floor(rnd() * (i + 1));
    [out[i], out[j]] = [out[j], out[i]];
  }
  return out;
}

/** URL-like ids with long shared prefixes, UTF-8 beyond ASCII, commas, quotes and a newline. */
function textIds(n: number, seed: number): string[] {
  const rnd = prng(seed);
  const hosts = ["council", "harbour", "ferry", "museum", "tourism", "mairie-île", "hafen-überfahrt", "港口", "🦅-kestrel"];
  const seen = new Set<string>(["a\u0000", "ab", "a", "b", 'say "hi", then go', "line\nbreak", "é", "e\u0301"]);
  // A zero byte is not the end of a string: these must sort by length.
  for (let k = 12; k >= 0; k--) seen.add(`tide${"\u0000".repeat(k)}`);
  while (seen.size < n) {
    const host = hosts[Math.floor(rnd() * hosts.length)];
    seen.add(`https://${host}.kestrel.example/p/${Math.floor(rnd() * n * 4)}${rnd() < 0.1 ? "?tide=ß" : ""}`);
  }
  return [...seen].slice(0, n);
}

const utf8Order = (a: string, b: string) => Buffer.compare(Buffer.from(a, "utf8"), Buffer.from(b, "utf8"));

describe("id order", () => {
  it("sorts integer ids as unsigned 64-bit numbers", () => {
    for (const n of [0, 1, 2, 500, 70_000]) {
      const ids = bigIds(n, n + 3);
      const perm = sortedIdOrder({ kind: "integer", ids });
      const want = [...ids].sort((a, b) => (a < b ? -1 : a > b ? 1 : 0));
      expect(Array.from(perm, (v) => ids[v])).toEqual(want);
    }
  });

  it("sorts string ids by their UTF-8 bytes", () => {
    for (const n of [0, 1, 9, 21, 3000, 40_000]) {
      const list = textIds(n, n + 5);
      const perm = sortedIdOrder(stringIds(list));
      expect(Array.from(perm, (v) => list[v])).toEqual([...list].sort(utf8Order));
    }
  });
});

describe("score index round trip", () => {
  it("keeps every integer id exactly (above 2^53 too), with its score bits and rank", async () => {
    const n = 150_000;
    const ids = bigIds(n, 11);
    const scores = scoresFor(n, 12);
    const file = nextFile();
    const header = await writeScoreIndex(file, { ids: { kind: "integer", ids }, scores });
    expect(header).toMatchObject({ version: 1, kind: "integer", n });
    expect(header.histogram).toEqual(logHistogram(scores));
    const want = ranks(scores);
    const index = await ScoreIndex.open(file);
    try {
      expect(index.digest).toMatch(/^[0-9a-f]{64}$/);
      const rnd = prng(13);
      const probes = [...[0n, 2n ** 53n + 1n, 2n ** 64n - 1n].map((id) => ids.indexOf(id)), 0, n - 1];
      for (let i = 0; i < 300; i++) probes.push(Math.floor(rnd() * n));
      for (const v of probes) {
        const hit = await index.lookup(ids[v].toString());
        expect(hit).not.toBeNull();
        expect(Object.is(hit?.score, scores[v])).toBe(true);
        expect(hit?.rank).toBe(want[v]);
        expect(await index.idText(hit?.slot ?? -1)).toBe(ids[v].toString());
      }
      // The slot order of every rank, read back through the order section.
      const order = rankOrder(scores);
      const slots = await index.order(0, n);
      for (let r = 0; r < n; r += 997) expect(await index.idText(slots[r])).toBe(ids[order[r]].toString());
      const padded = ids.indexOf(2n ** 53n + 1n);
      expect((await index.lookup(`000${(2n ** 53n + 1n).toString()}`))?.rank).toBe(want[padded]);
    } finally {
      await index.close();
    }
  });

  it("answers a missing id with null", async () => {
    const ids = BigUint64Array.of(5n, 2n ** 63n, 17n);
    const file = nextFile();
    await writeScoreIndex(file, { ids: { kind: "integer", ids }, scores: Float64Array.of(0.2, 0.5, 0.3) });
    const index = await ScoreIndex.open(file);
    try {
      expect(await index.lookup("17")).toEqual({ slot: 1, score: 0.3, rank: 2 });
      for (const missing of ["6", "0", (2n ** 63n + 1n).toString(), (2n ** 64n).toString(), "-5", "5.0", "", "ferry"]) {
        expect(await index.lookup(missing)).toBeNull();
      }
    } finally {
      await index.close();
    }
  });

  it("finds UTF-8 string ids byte for byte", async () => {
    const n = 90_000;
    const list = textIds(n, 21);
    const scores = scoresFor(n, 22);
    const file = nextFile();
    await writeScoreIndex(file, { ids: stringIds(list), scores });
    const want = ranks(scores);
    const index = await ScoreIndex.open(file);
    try {
      expect(index.kind).toBe("string");
      const rnd = prng(23);
      const probes = [0, 1, 2, 3, 4, 5, 6, 7, n - 1];
      for (let i = 0; i < 300; i++) probes.push(Math.floor(rnd() * n));
      for (const v of probes) {
        const hit = await index.lookup(list[v]);
        expect(hit?.rank).toBe(want[v]);
        expect(Object.is(hit?.score, scores[v])).toBe(true);
        expect(await index.idText(hit?.slot ?? -1)).toBe(list[v]);
      }
      for (const missing of ["", "https://nowhere.kestrel.example/", "https://ferry.kestrel.example/p/", "a\u0000\u0000", "E\u0301", "say \"hi\""]) {
        expect(await index.lookup(missing)).toBeNull();
      }
    } finally {
      await index.close();
    }
  });

  it("handles empty and one-node runs", async () => {
    for (const list of [[], ["harbour"]]) {
      const file = nextFile();
      await writeScoreIndex(file, { ids: stringIds(list), scores: Float64Array.from(list, () => 1) });
      const index = await ScoreIndex.open(file);
      expect(index.n).toBe(list.length);
      expect(await index.lookup("harbour")).toEqual(list.length ? { slot: 0, score: 1, rank: 1 } : null);
      await index.close();
    }
  });

  it("is rebuilt from an Arrow score file to the same bytes", async () => {
    const cases: Array<[NodeIds, Float64Array]> = [
      [{ kind: "integer", ids: bigIds(20_000, 31) }, scoresFor(20_000, 32)],
      [stringIds(textIds(20_000, 33)), scoresFor(20_000, 34)],
    ];
    for (const [ids, scores] of cases) {
      const direct = nextFile();
      await writeScoreIndex(direct, { ids, scores });
      const arrow = join(dir, `scores-${fileNo}.arrow`);
      await writeScores(arrow, "arrow", ids, scores, { run: "7" });
      const rebuilt = nextFile();
      await scoreIndexFromArrow(arrow, rebuilt);
      expect(Buffer.compare(await readFile(direct), await readFile(rebuilt))).toBe(0);
    }
  });

  it("refuses files that are not a whole index, and leaves no temp files behind", async () => {
    const file = nextFile();
    await writeScoreIndex(file, { ids: stringIds(["ferry", "harbour"]), scores: Float64Array.of(0.6, 0.4) });
    const bytes = await readFile(file);
    const broken = nextFile();
    await writeFile(broken, bytes.subarray(0, bytes.length - 4));
    await expect(ScoreIndex.open(broken)).rejects.toBeInstanceOf(ScoreIndexFormatError);
    await writeFile(broken, Buffer.concat([Buffer.from("not an index"), bytes]));
    await expect(ScoreIndex.open(broken)).rejects.toBeInstanceOf(ScoreIndexFormatError);
    await writeFile(broken, Buffer.from(bytes.toString("latin1").replace('"version":1', '"version":9'), "latin1"));
    await expect(ScoreIndex.open(broken)).rejects.toThrow(/version 9/);
    for (const json of ["null", '{"version":1,"kind":"string","n":2}']) {
      const prefix = Buffer.alloc(16);
      prefix.write("SPSCIDX\n", 0, "latin1");
      prefix.writeUInt32LE(json.length, 8);
      await writeFile(broken, Buffer.concat([prefix.subarray(0, 12), Buffer.from(json), Buffer.alloc(64)]));
      await expect(ScoreIndex.open(broken)).rejects.toBeInstanceOf(ScoreIndexFormatError);
    }
    expect((await readdir(dir)).filter((name) => name.endsWith(".tmp"))).toEqual([]);
  });
});

describe("joining two indexes", () => {
  async function open(ids: NodeIds, scores: Float64Array): Promise<ScoreIndex> {
    const file = nextFile();
    await writeScoreIndex(file, { ids, scores });
    return ScoreIndex.open(file);
  }

  async function allIds(index: ScoreIndex): Promise<string[]> {
    const out: string[] = [];
    for await (const block of index.idBlocks()) for (let i = 0; i < block.count; i++) out.push(blockIdText(block, i));
    return out;
  }

  /** match by text through a Map, the way the score files would be joined. */
  async function expectMatchByText(a: ScoreIndex, b: ScoreIndex, match: Int32Array): Promise<number> {
    const slotInB = new Map((await allIds(b)).map((id, s) => [id, s]));
    const want = Int32Array.from(await allIds(a), (id) => slotInB.get(id) ?? -1);
    expect(match).toEqual(want);
    return want.filter((s) => s >= 0).length;
  }

  it("needs no pass when both runs rank the same node set", async () => {
    const list = textIds(5000, 41);
    const a = await open(stringIds(list), scoresFor(5000, 42));
    const b = await open(stringIds([...list].reverse()), scoresFor(5000, 43));
    expect(await matchSlots(a, b)).toEqual({ match: null, monotone: true });
    await Promise.all([a.close(), b.close()]);
  });

  it("merges string tables of different graphs", async () => {
    const list = textIds(150_000, 51);
    const a = await open(stringIds(list.slice(0, 100_000)), scoresFor(100_000, 52));
    const b = await open(stringIds(list.slice(60_000)), scoresFor(90_000, 53));
    const { match, monotone } = await matchSlots(a, b);
    expect(monotone).toBe(true);
    if (!match) throw new Error("match expected");
    expect(await expectMatchByText(a, b, match)).toBe(40_000);
    await Promise.all([a.close(), b.close()]);
  });

  it("merges integer tables and matches integers to string ids by canonical decimal text", async () => {
    const ids = bigIds(3000, 61);
    const a = await open({ kind: "integer", ids: ids.slice(0, 2000) }, scoresFor(2000, 62));
    const b = await open({ kind: "integer", ids: ids.slice(1000) }, scoresFor(2000, 63));
    const ab = await matchSlots(a, b);
    if (!ab.match) throw new Error("match expected");
    expect(await expectMatchByText(a, b, ab.match)).toBe(1000);

    const texts = [...Array.from(ids.slice(0, 500), (v) => v.toString()), "0042", "ferry", (2n ** 64n).toString(), "-1"];
    const c = await open(stringIds(texts), scoresFor(texts.length, 64));
    for (const [x, y] of [[a, c], [c, a]] as const) {
      const { match, monotone } = await matchSlots(x, y);
      expect(monotone).toBe(false);
      if (!match) throw new Error("match expected");
      expect(await expectMatchByText(x, y, match)).toBe(500);
    }
    await Promise.all([a.close(), b.close(), c.close()]);
  });
});
