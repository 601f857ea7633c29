// The integer-line scanner in WebAssembly (workers/assembly/scan-lines.ts): the contract of scanIntegerLines, about
// twice its speed. Bytes go into the module's memory a block at a time and the parsed ids come back out; the copies
// cost a small share of what the scan saves.

import { assemblyModule } from "../tasks/assembly";
import { scanIntegerLines, type ScanState } from "./fast-scan";

type ScanFn = (
  p: number, e: number, delim: number, threeCols: number, cap: number, src: number, dst: number, w: number, stats: number,
) => number;

/** Input bytes per call at most; a line longer than this is left to the JS scanner. */
const BLOCK = 1 << 20;
/** The first block of a call: small, because the scan may refuse its first line (then the caller parses that line and
 *  calls again), and a refused line must not cost a megabyte's copy. Blocks grow while every line is taken. */
const FIRST_BLOCK = 4096;
/** Lines per block at most: the shortest line is "1 2\n". */
const OUT_CAP = BLOCK / 4 + 1;
const IN = 65_536;
const SRC = IN + BLOCK + 64;
const DST = SRC + OUT_CAP * 4;
const W = DST + OUT_CAP * 4;
const STATS = W + OUT_CAP * 8;
const BYTES = STATS + 64;

/** The compiled scanner, or null when the file cannot be read or compiled (the JS scanner then runs alone). */
export function scanModule(): WebAssembly.Module | null {
  try {
    return assemblyModule("scan-lines");
  } catch {
    return null;
  }
}

export class WasmScanner {
  readonly #scan: ScanFn;
  readonly #bytes: Uint8Array;
  readonly #u32: Uint32Array;
  readonly #f64: Float64Array;
  readonly #stats: Float64Array;

  constructor(module: WebAssembly.Module) {
    const instance = new WebAssembly.Instance(module, {});
    const memory = instance.exports.memory as WebAssembly.Memory;
    const have = memory.buffer.byteLength;
    if (have < BYTES) memory.grow(Math.ceil((BYTES - have) / 65_536));
    this.#scan = instance.exports.scan as ScanFn;
    this.#bytes = new Uint8Array(memory.buffer);
    this.#u32 = new Uint32Array(memory.buffer);
    this.#f64 = new Float64Array(memory.buffer);
    this.#stats = new Float64Array(memory.buffer, STATS, 5);
  }

  /** scanIntegerLines(buf, p, e, st), in blocks. */
  scan(buf: Uint8Array, p: number, e: number, st: ScanState): number {
    const stats = this.#stats;
    let block = FIRST_BLOCK;
    while (p < e && st.m < st.src.length) {
      const d = buf[p] - 48;
      if (d < 0 || d > 9) break;
      let end = e;
      if (e - p > block) {
        end = buf.lastIndexOf(10, p + block - 1) + 1;
        if (end <= p) return scanIntegerLines(buf, p, e, st);
      }
      block = Math.min(BLOCK, block * 8);
      const len = end - p;
      this.#bytes.set(buf.subarray(p, end), IN);
      stats[1] = st.selfLoops;
      stats[2] = st.maxId;
      stats[3] = st.weightMin;
      stats[4] = st.weightMax;
      const room = Math.min(st.src.length - st.m, OUT_CAP);
      const q = this.#scan(IN, IN + len, st.delim, st.threeCols ? 1 : 0, room, SRC, DST, st.weight ? W : 0, STATS);
      const k = stats[0];
      st.src.set(this.#u32.subarray(SRC >> 2, (SRC >> 2) + k), st.m);
      st.dst.set(this.#u32.subarray(DST >> 2, (DST >> 2) + k), st.m);
      if (st.weight) st.weight.set(this.#f64.subarray(W >> 3, (W >> 3) + k), st.m);
      st.m += k;
      st.lines += k;
      st.dataRows += k;
      st.selfLoops = stats[1];
      st.maxId = stats[2];
      st.weightMin = stats[3];
      st.weightMax = stats[4];
      p += q - IN;
      if (q - IN < len) break;
    }
    return p;
  }
}
