// The score index: one run's scores and ranks keyed by the run's original node ids, laid out for positioned reads.
//
//   [0, 8)        magic "SPSCIDX\n"
//   [8, 12)       uint32 LE: byte length L of the header
//   [12, 12 + L)  header, JSON (UTF-8); zero padding up to the next multiple of 8 = the data start
//   sections      at data start + section.offset, each 8-byte aligned, little-endian:
//     ids         integer ids: uint64 × n, ascending;  string ids: uint32 × (n + 1) offsets into idBytes
//     idBytes     string ids only: the UTF-8 bytes of every id, ids ascending by bytes
//     scores      float64 × n: score of the node in slot s (slot = position of its id in sorted order)
//     ranks       uint32 × n: rank (1 = highest) of the node in slot s
//     order       uint32 × n: slot of the node at rank r + 1
//
// Slots order nodes by original id, so two indexes over the same id set (same digest) line up slot for slot, and
// any two indexes of the same id kind can be joined by one merge pass over their id tables.
import type { Histogram } from "../../../api/contracts/runs";

export const SCORE_INDEX_FILE = "scores.index";
export const SCORE_INDEX_VERSION = 1;

const MAGIC = "SPSCIDX\n";
const PREFIX_BYTES = 12;

export type IdKind = "integer" | "string";

export interface Section {
  /** Byte offset from the data start. */
  offset: number;
  bytes: number;
}

export interface ScoreIndexSections {
  ids: Section;
  idBytes: Section;
  scores: Section;
  ranks: Section;
  order: Section;
}

export interface ScoreIndexHeader {
  version: number;
  kind: IdKind;
  n: number;
  /** sha256 (hex) of the ids and idBytes sections: equal digests mean equal sorted id tables. */
  digest: string;
  sections: ScoreIndexSections;
  /** Score distribution, computed when the index was written. */
  histogram: Histogram;
}

const align8 = (x: number) => Math.ceil(x / 8) * 8;

/** Section placement for n nodes (and `idByteCount` bytes of string ids). */
export function sectionLayout(kind: IdKind, n: number, idByteCount: number): ScoreIndexSections {
  let at = 0;
  const next = (bytes: number): Section => {
    const s = { offset: at, bytes };
    at = align8(at + bytes);
    return s;
  };
  const ids = next(kind === "integer" ? 8 * n : 4 * (n + 1));
  const idBytes = next(kind === "string" ? idByteCount : 0);
  return { ids, idBytes, scores: next(8 * n), ranks: next(4 * n), order: next(4 * n) };
}

/** The file's first bytes up to the data start: magic, header length, header, padding. */
export function encodePrefix(header: ScoreIndexHeader): Uint8Array {
  const json = Buffer.from(JSON.stringify(header), "utf8");
  const out = Buffer.alloc(align8(PREFIX_BYTES + json.length));
  out.write(MAGIC, 0, "latin1");
  out.writeUInt32LE(json.length, 8);
  json.copy(out, PREFIX_BYTES);
  return out;
}

export class ScoreIndexFormatError extends Error {
  override readonly name = "ScoreIndexFormatError";
}

/** How many bytes to read to learn the header length. */
export const PREFIX_PROBE_BYTES = PREFIX_BYTES;

/** Header length from the first 12 bytes; throws ScoreIndexFormatError when the magic is wrong. */
export function headerLength(probe: Uint8Array): number {
  const b = Buffer.from(probe.buffer, probe.byteOffset, probe.byteLength);
  if (b.length < PREFIX_BYTES || b.toString("latin1", 0, 8) !== MAGIC) throw new ScoreIndexFormatError("not a score index (bad magic)");
  return b.readUInt32LE(8);
}

export function dataStart(headerBytes: number): number {
  return align8(PREFIX_BYTES + headerBytes);
}

/** Parses and checks the header against the file size; throws ScoreIndexFormatError on any mismatch. */
export function decodeHeader(json: Uint8Array, fileBytes: number): ScoreIndexHeader {
  let header: ScoreIndexHeader;
  try {
    header = JSON.parse(Buffer.from(json.buffer, json.byteOffset, json.byteLength).toString("utf8")) as ScoreIndexHeader;
  } catch {
    throw new ScoreIndexFormatError("score index header is not JSON");
  }
  if (typeof header !== "object" || header === null) throw new ScoreIndexFormatError("score index header is not an object");
  if (header.version !== SCORE_INDEX_VERSION) throw new ScoreIndexFormatError(`score index version ${String(header.version)}, expected ${SCORE_INDEX_VERSION}`);
  if (header.kind !== "integer" && header.kind !== "string") throw new ScoreIndexFormatError("score index id kind must be integer or string");
  if (!Number.isInteger(header.n) || header.n < 0) throw new ScoreIndexFormatError("score index node count must be an integer ≥ 0");
  if (typeof header.digest !== "string" || !Array.isArray(header.histogram?.bins)) throw new ScoreIndexFormatError("score index header lacks its digest or histogram");
  const expected = sectionLayout(header.kind, header.n, header.sections?.idBytes?.bytes ?? 0);
  const start = dataStart(json.byteLength);
  for (const name of ["ids", "idBytes", "scores", "ranks", "order"] as const) {
    const got = header.sections?.[name];
    if (got?.offset !== expected[name].offset || got.bytes !== expected[name].bytes) throw new ScoreIndexFormatError(`score index section ${name} is misplaced`);
  }
  const end = start + expected.order.offset + expected.order.bytes;
  if (end > fileBytes) throw new ScoreIndexFormatError(`score index is truncated: ${fileBytes} bytes, ${end} expected`);
  return header;
}
