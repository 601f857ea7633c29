// CSV score rows formatted straight into bytes: "node_id,score,rank\n" per node in rank order. Pure functions over
// typed arrays, so that worker threads can format slices of the rows in parallel (see CsvRowPool).

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

/**
 * Rows for ranks from+1 .. to (order[from..to)) into out, which holds (to − from) · rowBound(ids) bytes; returns the
 * bytes written. The score is JavaScript's shortest round-trip decimal, so it parses back to the same bits.
 */
export function formatRows(ids: CsvIds, scores: Float64Array, order: Uint32Array, from: number, to: number, out: Uint8Array): number {
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
      at = putAscii(out, at, String(score));
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
}

/** Threads that format CSV rows; formatCsvRows resolves with the bytes written into task.out. */
export interface CsvRowPool {
  readonly threads: number;
  formatCsvRows(task: CsvRowsTask): Promise<number>;
}
