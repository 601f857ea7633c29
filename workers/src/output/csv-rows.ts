// CSV score rows formatted straight into bytes: "node_id,score,rank\n" per node in rank order. Functions over typed
// arrays, so that worker threads can format slices of the rows in parallel (see CsvRowPool). Score text comes from
// the score-text WebAssembly module when the caller has one (ScoreText), else from String(); the bytes are the same.

import type { NodeIds } from "../core/graph";

export const CSV_HEADER = "node_id,score,rank\n";
const QUOTE = 0x22;
const COMMA = 0x2c;
const NEWLINE = 0x0a;

/** Ids as the row formatter reads them: integer ids as pairs of 32-bit words (low first), string ids as UTF-8. */
export type CsvIds = { kind: "integer"; words: Uint32Array } | { kind: "string"; bytes: Uint8Array; offsets: Uint32Array };

export function csvIds(ids: NodeIds): CsvIds {
  if (ids.kind === "string") return ids;
  return { kind: "integer", words: new Uint32Array(ids.ids.buffer, ids.ids.byteOffset, 2 * ids.ids.length) };
}

/** Upper bound of one row's bytes: the id (quoted, quotes doubled), a score of at most 24 characters, a rank. */
export function rowBound(ids: CsvIds): number {
  if (ids.kind === "integer") return 64;
  let longest = 0;
  for (let v = 0; v + 1 < ids.offsets.length; v++) longest = Math.max(longest, ids.offsets[v + 1] - ids.offsets[v]);
  return 2 * longest + 64;
}

/** Appends text of single-byte characters (digits, '.', 'e', '-', '+') at `at`; returns the new end. */
function putAscii(buf: Uint8Array, at: number, text: string): number {
  for (let i = 0; i < text.length; i++) buf[at++] = text.charCodeAt(i);
  return at;
}

/** Appends the decimal digits of a non-negative integer below 2^53. */
function putUint(buf: Uint8Array, at: number, v: number): number {
  if (v < 10) {
    buf[at] = 48 + v;
    return at + 1;
  }
  let digits = 0;
  for (let t = v; t >= 1; t = Math.floor(t / 10)) digits++;
  for (let i = at + digits - 1; i >= at; i--) {
    const q = Math.floor(v / 10);
    buf[i] = 48 + (v - q * 10);
    v = q;
  }
  return at + digits;
}

/** Appends a node id as a CSV field: integers as digits, strings quoted when they hold '"', ',', CR or LF. */
function putId(buf: Uint8Array, at: number, ids: CsvIds, v: number): number {
  if (ids.kind === "integer") {
    const lo = ids.words[2 * v];
    const hi = ids.words[2 * v + 1];
    if (hi < 0x200000) return putUint(buf, at, hi * 4294967296 + lo);
    return putAscii(buf, at, ((BigInt(hi) << 32n) | BigInt(lo)).toString());
  }
  const bytes = ids.bytes.subarray(ids.offsets[v], ids.offsets[v + 1]);
  let plain = true;
  for (let i = 0; i < bytes.length; i++) {
    const b = bytes[i];
    if (b === QUOTE || b === COMMA || b === NEWLINE || b === 0x0d) {
      plain = false;
      break;
    }
  }
  if (plain) {
    buf.set(bytes, at);
    return at + bytes.length;
  }
  buf[at++] = QUOTE;
  for (let i = 0; i < bytes.length; i++) {
    if (bytes[i] === QUOTE) buf[at++] = QUOTE;
    buf[at++] = bytes[i];
  }
  buf[at++] = QUOTE;
  return at;
}

/** Rows the score-text module formats per call: its memory holds their ids, scores and text. */
const TEXT_ROWS = 4096;
/** Bytes of one integer-id row at most: 20 id digits, 24 score characters, 10 rank digits, 3 separators. */
const TEXT_ROW_BYTES = 64;

interface ScoreTextExports {
  memory: WebAssembly.Memory;
  text(value: number, at: number): number;
  rows(ids: number, scores: number, count: number, firstRank: number, out: number): number;
  done(): number;
  dataEnd(): number;
}

/**
 * The score-text module (workers/assembly/score-text.ts) instantiated on this thread: String(score) bytes without
 * making strings, and whole rows for integer ids. Its texts equal String()'s; where its arithmetic cannot decide
 * (about 0.4% of doubles) it declines and String() is asked.
 */
export class ScoreText {
  static #instance: ScoreText | null = null;
  readonly #x: ScoreTextExports;
  readonly #ids: number;
  readonly #scores: number;
  readonly #out: number;
  readonly #bytes: Uint8Array;
  readonly #words: Uint32Array;
  readonly #values: Float64Array;

  private constructor(module: WebAssembly.Module) {
    this.#x = new WebAssembly.Instance(module, {}).exports as unknown as ScoreTextExports;
    const base = Math.ceil(this.#x.dataEnd() / 64) * 64;
    this.#ids = base;
    this.#scores = base + TEXT_ROWS * 8;
    this.#out = base + TEXT_ROWS * 16;
    const need = this.#out + TEXT_ROWS * TEXT_ROW_BYTES;
    const have = this.#x.memory.buffer.byteLength;
    if (need > have) this.#x.memory.grow(Math.ceil((need - have) / 65_536));
    const buffer = this.#x.memory.buffer;
    this.#bytes = new Uint8Array(buffer);
    this.#words = new Uint32Array(buffer, this.#ids, 2 * TEXT_ROWS);
    this.#values = new Float64Array(buffer, this.#scores, TEXT_ROWS);
  }

  /**
   * One instance per thread: every module given is a compile of the one file (a module sent to a thread arrives as a
   * new object with each message, so the first instance serves them all).
   */
  static of(module: WebAssembly.Module): ScoreText {
    ScoreText.#instance ??= new ScoreText(module);
    return ScoreText.#instance;
  }

  /** Whether the module spells `value` itself (else put() asks String()). */
  spells(value: number): boolean {
    return this.#x.text(value, this.#out) >= 0;
  }

  /** String(value) as bytes at buf[at..]; returns the new end. */
  put(buf: Uint8Array, at: number, value: number): number {
    const len = this.#x.text(value, this.#out);
    if (len < 0) return putAscii(buf, at, String(value));
    const src = this.#bytes;
    for (let i = 0, p = this.#out; i < len; i++) buf[at++] = src[p++];
    return at;
  }

  /** formatRows for integer ids: rows gathered TEXT_ROWS at a time into the module's memory and formatted there. */
  integerRows(words: Uint32Array, scores: Float64Array, order: Uint32Array, from: number, to: number, out: Uint8Array): number {
    const ids = this.#words;
    const values = this.#values;
    let at = 0;
    for (let start = from; start < to; ) {
      const count = Math.min(TEXT_ROWS, to - start);
      for (let j = 0; j < count; j++) {
        const v = order[start + j];
        ids[2 * j] = words[2 * v];
        ids[2 * j + 1] = words[2 * v + 1];
        values[j] = scores[v];
      }
      // The module stops before a score it declines to spell: that row is written here and the rest go back to it.
      for (let j = 0; j < count; ) {
        const bytes = this.#x.rows(this.#ids + 8 * j, this.#scores + 8 * j, count - j, start + j + 1, this.#out);
        out.set(this.#bytes.subarray(this.#out, this.#out + bytes), at);
        at += bytes;
        j += this.#x.done();
        if (j < count) {
          at += formatRows({ kind: "integer", words }, scores, order, start + j, start + j + 1, out.subarray(at));
          j++;
        }
      }
      start += count;
    }
    return at;
  }
}

/**
 * Rows for ranks from+1 .. to (order[from..to)) into out, which holds (to − from) · rowBound(ids) bytes; returns the
 * bytes written. The score is JavaScript's shortest round-trip decimal, so it parses back to the same bits; `text`
 * spells it faster, with the same bytes.
 */
export function formatRows(
  ids: CsvIds,
  scores: Float64Array,
  order: Uint32Array,
  from: number,
  to: number,
  out: Uint8Array,
  text?: ScoreText,
): number {
  if (text && ids.kind === "integer") return text.integerRows(ids.words, scores, order, from, to, out);
  let at = 0;
  // Rows come in rank order, so equal scores are neighbours (often: every node with the same in-links has the same
  // score); the previous score's text is copied instead of formatted again.
  let prev = NaN;
  let prevAt = 0;
  let prevLen = 0;
  for (let i = from; i < to; i++) {
    const v = order[i];
    at = putId(out, at, ids, v);
    out[at++] = COMMA;
    const score = scores[v];
    if (score === prev) {
      out.copyWithin(at, prevAt, prevAt + prevLen);
      at += prevLen;
    } else {
      prevAt = at;
      at = text ? text.put(out, at, score) : putAscii(out, at, String(score));
      prevLen = at - prevAt;
      prev = score;
    }
    out[at++] = COMMA;
    at = putUint(out, at, i + 1);
    out[at++] = NEWLINE;
  }
  return at;
}

/** Rows [from, to) formatted on another thread into `out`; every array lives in shared memory. */
export interface CsvRowsTask {
  ids: CsvIds;
  scores: Float64Array;
  order: Uint32Array;
  from: number;
  to: number;
  out: SharedArrayBuffer;
  /** The compiled score-text module (threads do not load module files themselves). */
  textModule?: WebAssembly.Module;
}

/** Threads that format CSV rows; formatCsvRows resolves with the bytes written into task.out. */
export interface CsvRowPool {
  readonly threads: number;
  formatCsvRows(task: CsvRowsTask): Promise<number>;
}
