// The score-text WebAssembly module spells scores as JavaScript does. Reference: the engine's own String(number)
// (ECMA-262 Number::toString: the shortest decimal that reads back as the same double, the closest one when several
// are as short), compared byte for byte; the module must decline rather than differ.
import { readFile } from "node:fs/promises";
import { describe, expect, it } from "vitest";
import { csvIds, formatRows, rowBound, ScoreText } from "../../workers/src/output/csv-rows";
import { assemblyModule } from "../../workers/src/tasks/assembly";
import { compileAssembly } from "../fixtures/assembly";
import { prng } from "./rank-test-graphs";

const text = ScoreText.of(assemblyModule("score-text"));
const decoder = new TextDecoder();

function spelled(value: number): string {
  const buf = new Uint8Array(32);
  return decoder.decode(buf.subarray(0, text.put(buf, 0, value)));
}

/** Doubles from random bit patterns: every exponent, subnormals included (NaN and infinities skipped). */
function randomDoubles(count: number, seed: number): Float64Array {
  const rnd = prng(seed);
  const out = new Float64Array(count);
  const words = new Uint32Array(out.buffer);
  for (let i = 0; i < 2 * count; i++) words[i] = Math.floor(rnd() * 2 ** 32);
  for (let i = 0; i < count; i++) if (!Number.isFinite(out[i])) out[i] = i;
  return out;
}

describe("score-text module", () => {
  it("score-text.wasm matches a fresh compile of workers/assembly/score-text.ts (npm run build:wasm)", async () => {
    const fresh = await compileAssembly("workers/assembly/score-text.ts", "text");
    expect(Buffer.compare(Buffer.from(fresh), await readFile(new URL("../../workers/assembly/score-text.wasm", import.meta.url)))).toBe(0);
  });

  it("spells 400,000 random doubles of every magnitude exactly as String() does", () => {
    const values = randomDoubles(200_000, 11);
    const rnd = prng(12);
    const scores = Float64Array.from({ length: 200_000 }, () => rnd() * 10 ** -Math.floor(rnd() * 12));
    let differ = 0;
    for (const v of [...values, ...scores]) if (spelled(v) !== String(v)) differ++;
    expect(differ).toBe(0);
  });

  it("spells the edge cases: zeros, negatives, powers of two and ten, the notation switches at 1e21 and 1e-7", () => {
    const cases = [0, -0, 1, -1, 0.1, 0.2, 0.3, 1 / 3, 2 / 3, 5e-324, -5e-324, 2.2250738585072014e-308, Number.MAX_VALUE, Number.MIN_VALUE];
    for (let e = -1074; e <= 1023; e++) cases.push(2 ** e, -(2 ** e));
    for (let e = -323; e <= 308; e++) cases.push(Number(`1e${e}`), Number(`9.999999999999999e${e}`), Number(`1.5e${e}`));
    cases.push(1e21, 999999999999999900000, 1e-7, 1e-6, 0.000001, 0.0000012345, 123456789012345680000, 4294967296, 2 ** 53, 2 ** 53 + 2);
    for (let i = 1; i < 20_000; i++) cases.push(i, i / 1000, 1 / i, i * 1e-9);
    const wrong = cases.filter((v) => spelled(v) !== String(v)).map((v) => `${String(v)} as ${spelled(v)}`);
    expect(wrong).toEqual([]);
    expect(spelled(Number.NaN)).toBe("NaN");
    expect(spelled(Number.POSITIVE_INFINITY)).toBe("Infinity");
  });

  it("declines a few doubles (64-bit arithmetic cannot decide them) and String() spells those", () => {
    const values = randomDoubles(100_000, 13);
    const declined = [...values].filter((v) => !text.spells(v));
    // Grisu3 declines about half a percent of doubles (its paper measures 0.5%): enough to test the way back.
    expect(declined.length).toBeGreaterThan(50);
    expect(declined.length).toBeLessThan(1000);
    for (const v of declined) expect(spelled(v)).toBe(String(v));
  });
});

describe("CSV rows through the module", () => {
  const N = 20_000; // several of the module's 4,096-row batches

  /** Scores with ties, zeros and values the module declines (so rows go back and forth between module and JS). */
  function scores(): Float64Array {
    const rnd = prng(21);
    const hard = [...randomDoubles(50_000, 22)].filter((v) => !text.spells(v) && v > 0).slice(0, 200);
    expect(hard.length).toBeGreaterThan(100);
    const s = Float64Array.from({ length: N }, (_, i) => (i % 97 === 0 ? hard[(i / 97) % hard.length] : rnd() * 1e-4));
    s.fill(0.25, 5000, 6000);
    s.fill(0, 9000, 9100);
    s.fill(-0, 9100, 9110);
    for (let i = 4090; i < 4100; i++) s[i] = hard[i % hard.length]; // declines at a batch boundary
    return s;
  }

  function rows(ids: ReturnType<typeof csvIds>, s: Float64Array, order: Uint32Array, withText: boolean): string {
    const out = new Uint8Array(N * rowBound(ids));
    return decoder.decode(out.subarray(0, formatRows(ids, s, order, 0, N, out, withText ? text : undefined)));
  }

  it("are the same bytes as String()'s for integer ids up to 2^64 - 1, in any row order", () => {
    const rnd = prng(23);
    const big = new BigUint64Array(N);
    for (let i = 0; i < N; i++) big[i] = i % 7 === 0 ? 2n ** 64n - 1n - BigInt(i) : BigInt(Math.floor(rnd() * 2 ** 53));
    const ids = csvIds({ kind: "integer", ids: big });
    const s = scores();
    const order = Uint32Array.from({ length: N }, (_, i) => (i * 7919) % N);
    const fast = rows(ids, s, order, true);
    expect(fast).toBe(rows(ids, s, order, false));
    expect(fast.startsWith("18446744073709551615,")).toBe(true); // id 2^64 - 1 is node 0, first in this order
    expect(fast.split("\n")).toHaveLength(N + 1);
  });

  it("are the same bytes for string ids, quoted where needed", () => {
    const enc = new TextEncoder();
    const parts = Array.from({ length: N }, (_, i) => enc.encode(i % 13 === 0 ? `reef "${i}", north` : `atoll-${i}-ø`));
    const offsets = new Uint32Array(N + 1);
    parts.forEach((p, i) => (offsets[i + 1] = offsets[i] + p.length));
    const bytes = new Uint8Array(offsets[N]);
    parts.forEach((p, i) => bytes.set(p, offsets[i]));
    const ids = csvIds({ kind: "string", bytes, offsets });
    const s = scores();
    const order = Uint32Array.from({ length: N }, (_, i) => N - 1 - i);
    const fast = rows(ids, s, order, true);
    expect(fast).toBe(rows(ids, s, order, false));
    expect(fast).toContain('"reef ""0"", north",');
  });
});
