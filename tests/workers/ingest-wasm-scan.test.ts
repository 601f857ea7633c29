// The WebAssembly integer-line scanner against the JS one: the committed binary is what its source compiles to, and on
// every kind of line (taken or refused) both stop at the same byte with the same ids, weights and counts.
import { readFile } from "node:fs/promises";
import { afterAll, describe, expect, it } from "vitest";
import { scanIntegerLines, type ScanState } from "../../workers/src/ingest/fast-scan";
import { ingestEdgeFile } from "../../workers/src/ingest/ingest";
import { scanModule, WasmScanner } from "../../workers/src/ingest/wasm-scan";
import { compileAssembly } from "../fixtures/assembly";
import { edgeList, TempFiles } from "../fixtures/edges/edge-files";
import { prng } from "./rank-test-graphs";

const files = new TempFiles();
afterAll(() => files.remove());

describe("committed scanner binary", () => {
  it("matches a fresh compile of workers/assembly/scan-lines.ts (npm run build:wasm)", async () => {
    const fresh = await compileAssembly("workers/assembly/scan-lines.ts", "scan");
    expect(Buffer.compare(Buffer.from(fresh), await readFile(new URL("../../workers/assembly/scan-lines.wasm", import.meta.url)))).toBe(0);
  });
});

function state(delim: number, threeCols: boolean, cap: number, weights: boolean): ScanState {
  return {
    delim,
    threeCols,
    src: new Uint32Array(cap),
    dst: new Uint32Array(cap),
    weight: weights ? new Float64Array(cap) : null,
    m: 0,
    lines: 0,
    dataRows: 0,
    selfLoops: 0,
    maxId: -1,
    weightMin: Infinity,
    weightMax: -Infinity,
  };
}

/** Scan `text` with both scanners, restarting after each refused line as the parser does; compare all state. */
function compare(text: string, delim: number, threeCols: boolean, cap = 1 << 16): { stops: number[]; st: ScanState } {
  const module = scanModule();
  if (!module) throw new Error("scanner module missing");
  const wasm = new WasmScanner(module);
  const buf = Buffer.from(text, "latin1");
  const a = state(delim, threeCols, cap, threeCols);
  const b = state(delim, threeCols, cap, threeCols);
  const stops: number[] = [];
  for (let p = 0; p < buf.length; ) {
    const pa = scanIntegerLines(buf, p, buf.length, a);
    const pb = wasm.scan(buf, p, buf.length, b);
    expect(pb).toBe(pa);
    if (pa >= buf.length || a.m === cap) break;
    stops.push(pa);
    p = buf.indexOf(10, pa) + 1;
  }
  for (const key of ["m", "lines", "dataRows", "selfLoops", "maxId", "weightMin", "weightMax"] as const) expect(b[key], key).toBe(a[key]);
  expect(Array.from(b.src.subarray(0, b.m))).toEqual(Array.from(a.src.subarray(0, a.m)));
  expect(Array.from(b.dst.subarray(0, b.m))).toEqual(Array.from(a.dst.subarray(0, a.m)));
  if (a.weight && b.weight) expect(Buffer.from(b.weight.buffer, 0, b.m * 8).equals(Buffer.from(a.weight.buffer, 0, a.m * 8))).toBe(true);
  return { stops, st: a };
}

const TRICKY = [
  "1 2\n",
  "0\t4294967295\n", // largest id the fast path takes
  "4294967296 1\n", // 2^32: refused (left to the general path)
  "1 99999999999999999999999\n", // far past 2^64: refused without overflow
  "7 7\n", // self-loop
  "3  \t 4\n", // a run of blanks
  "5 6\r\n", // CRLF
  "5 6\r7\n", // a lone CR: refused
  "x 1\n",
  "1 y\n",
  "1\n",
  "1 2 3\n", // a third column where two are expected: refused
  "\n",
  "  1 2\n", // leading blank: refused
];

const WEIGHTED = [
  "1 2 0.5\n",
  "1 2 3\n",
  "1 2 123456789012345\n", // 15 characters: taken
  "1 2 1234567890123456\n", // 16: refused
  "1 2 .5\n", // leading dot: refused
  "1 2 5.\n", // trailing dot: refused
  "1 2 1.2.3\n",
  "1 2 0.1\r\n",
  "1 2 -1\n",
  "1 2\n", // missing weight: refused
  "9 9 2.75\n",
  "1 2 3 4\n",
];

describe("WebAssembly scanner", () => {
  it("takes and refuses the same lines as the JS scanner (spaces, tabs, commas)", () => {
    for (const [delim, sep] of [
      [32, " "],
      [9, "\t"],
      [44, ","],
    ] as const) {
      const text = TRICKY.map((l) => (delim === 32 ? l : l.replace(/^(\S+) /, `$1${sep}`))).join("");
      const { stops } = compare(text, delim, false);
      expect(stops.length).toBeGreaterThan(5);
      const w = WEIGHTED.map((l) => (delim === 32 ? l : l.replaceAll(" ", sep))).join("");
      expect(compare(w, delim, true).stops.length).toBeGreaterThan(5);
    }
  });

  it("agrees on a long random file crossing many blocks, up to a full edge array", () => {
    const rnd = prng(5);
    const lines: string[] = [];
    for (let i = 0; i < 400_000; i++) {
      const u = Math.floor(rnd() ** 3 * 2 ** 32);
      const v = Math.floor(rnd() * 1e6);
      const w = (Math.floor(rnd() * 1e6) / 1000).toString();
      lines.push(rnd() < 0.001 ? "bad line\n" : `${u}\t${v}\t${w}${rnd() < 0.5 ? "\r" : ""}\n`);
    }
    const text = lines.join("");
    expect(text.length).toBeGreaterThan(4 << 20);
    const { st } = compare(text, 9, true, 1 << 20);
    expect(st.m).toBeGreaterThan(390_000);
    // A full edge array stops both at the same line.
    expect(compare(text, 9, true, 123_457).st.m).toBe(123_457);
  });

  it("agrees when it refuses every line (17-digit weights), one line at a time", async () => {
    let text = "";
    for (let i = 0; i < 3000; i++) text += `${i % 97} ${(i * 7) % 89} 0.${String(30000000000000004n + BigInt(i))}\n`;
    const path = files.write(text);
    const opts = { limits: { threads: 1 } };
    const viaWasm = await ingestEdgeFile(path, { weighted: true }, opts);
    const viaJs = await ingestEdgeFile(path, { weighted: true }, { ...opts, jsScanner: true });
    expect(viaWasm.stats).toEqual(viaJs.stats);
    expect(edgeList(viaWasm.graph)).toEqual(edgeList(viaJs.graph));
  });

  it("gives the same graph through ingest as the JS scanner", async () => {
    const rnd = prng(9);
    let text = "# comment\n";
    for (let i = 0; i < 50_000; i++) text += `${Math.floor(rnd() * 5000)} ${Math.floor(rnd() * 5000)}${i % 997 === 0 ? " " : ""}\n`;
    text += "18446744073709551615 3\n";
    const path = files.write(text);
    const opts = { limits: { threads: 2, chunkBytes: 64 * 1024, parallelMinBytes: 1 } };
    const viaWasm = await ingestEdgeFile(path, {}, opts);
    const viaJs = await ingestEdgeFile(path, {}, { ...opts, jsScanner: true });
    expect(viaWasm.stats).toEqual(viaJs.stats);
    expect(edgeList(viaWasm.graph)).toEqual(edgeList(viaJs.graph));
  });
});
