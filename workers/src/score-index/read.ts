// Reading a score index with positioned reads: the header once, then only the bytes a question needs.
import { open, type FileHandle } from "node:fs/promises";
import { endianness } from "node:os";
import type { Histogram } from "../../../api/contracts/runs";
import { dataStart, decodeHeader, headerLength, PREFIX_PROBE_BYTES, ScoreIndexFormatError, type IdKind, type ScoreIndexHeader, type Section } from "./format";
import { compareBytes, compareU64 } from "./id-order";

if (endianness() !== "LE") throw new Error("score index files are little-endian; this host is big-endian");

/** Below this many candidates a binary search reads the rest of its range at once. */
const INT_WINDOW = 1024;
const STRING_WINDOW = 64;
const BLOCK_ENTRIES = 1 << 16;
const BLOCK_MAX_BYTES = 8 << 20;
const MAX_U64 = (1n << 64n) - 1n;

/** A run of consecutive slots' ids. Integer ids as (lo, hi) 32-bit pairs; string ids as absolute offsets + bytes. */
export type IdBlock =
  | { kind: "integer"; start: number; count: number; words: Uint32Array }
  | { kind: "string"; start: number; count: number; offsets: Uint32Array; bytes: Uint8Array; base: number };

const utf8 = new TextDecoder("utf-8");

/** The unsigned 64-bit value written in canonical-or-padded decimal, or null when `text` is not one. */
export function parseU64(text: string): bigint | null {
  if (!/^\d{1,20}$/.test(text)) return null;
  const v = BigInt(text);
  return v <= MAX_U64 ? v : null;
}

export class ScoreIndex {
  private constructor(
    private readonly fh: FileHandle,
    readonly header: ScoreIndexHeader,
    private readonly start: number,
  ) {}

  /** Opens and checks an index; throws ScoreIndexFormatError when the file is not a readable index. */
  static async open(path: string): Promise<ScoreIndex> {
    const fh = await open(path, "r");
    try {
      const size = (await fh.stat()).size;
      const probe = await readAt(fh, 0, Math.min(PREFIX_PROBE_BYTES, size));
      const length = headerLength(probe);
      if (PREFIX_PROBE_BYTES + length > size) throw new ScoreIndexFormatError("score index header is truncated");
      const header = decodeHeader(await readAt(fh, PREFIX_PROBE_BYTES, length), size);
      return new ScoreIndex(fh, header, dataStart(length));
    } catch (error) {
      await fh.close();
      throw error;
    }
  }

  get n(): number {
    return this.header.n;
  }

  get kind(): IdKind {
    return this.header.kind;
  }

  get digest(): string {
    return this.header.digest;
  }

  get histogram(): Histogram {
    return this.header.histogram;
  }

  close(): Promise<void> {
    return this.fh.close();
  }

  /** Bytes [from, from + bytes) of a section, in a fresh 8-aligned buffer. */
  private section(section: Section, from: number, bytes: number): Promise<Uint8Array> {
    if (from < 0 || from + bytes > section.bytes) throw new RangeError(`read past a section: ${from}+${bytes} of ${section.bytes}`);
    return readAt(this.fh, this.start + section.offset + from, bytes);
  }

  async scores(from: number, count: number): Promise<Float64Array> {
    const b = await this.section(this.header.sections.scores, 8 * from, 8 * count);
    return new Float64Array(b.buffer, 0, count);
  }

  async ranks(from: number, count: number): Promise<Uint32Array> {
    const b = await this.section(this.header.sections.ranks, 4 * from, 4 * count);
    return new Uint32Array(b.buffer, 0, count);
  }

  /** Slots of the nodes at ranks from + 1 .. from + count. */
  async order(from: number, count: number): Promise<Uint32Array> {
    const b = await this.section(this.header.sections.order, 4 * from, 4 * count);
    return new Uint32Array(b.buffer, 0, count);
  }

  /** String ids only: offsets[from .. from + count] (count + 1 entries). */
  private async offsets(from: number, count: number): Promise<Uint32Array> {
    const b = await this.section(this.header.sections.ids, 4 * from, 4 * (count + 1));
    return new Uint32Array(b.buffer, 0, count + 1);
  }

  /** Integer ids only: (lo, hi) pairs of slots from .. from + count − 1. */
  private async words(from: number, count: number): Promise<Uint32Array> {
    const b = await this.section(this.header.sections.ids, 8 * from, 8 * count);
    return new Uint32Array(b.buffer, 0, 2 * count);
  }

  /** Ids of slots [from, from + count), at most count of them (string blocks stop near BLOCK_MAX_BYTES). */
  async idBlock(from: number, count: number): Promise<IdBlock> {
    if (this.kind === "integer") return { kind: "integer", start: from, count, words: await this.words(from, count) };
    const offsets = await this.offsets(from, count);
    let take = count;
    if (offsets[take] - offsets[0] > BLOCK_MAX_BYTES) {
      take = 1;
      while (take < count && offsets[take + 1] - offsets[0] <= BLOCK_MAX_BYTES) take++;
    }
    const bytes = await this.section(this.header.sections.idBytes, offsets[0], offsets[take] - offsets[0]);
    return { kind: "string", start: from, count: take, offsets: offsets.subarray(0, take + 1), bytes, base: offsets[0] };
  }

  /** Every slot's id in order, a block at a time. */
  async *idBlocks(): AsyncGenerator<IdBlock> {
    for (let from = 0; from < this.n; ) {
      const block = await this.idBlock(from, Math.min(BLOCK_ENTRIES, this.n - from));
      yield block;
      from += block.count;
    }
  }

  /** The original id of a slot, as text (decimal for integer ids). */
  async idText(slot: number): Promise<string> {
    const block = await this.idBlock(slot, 1);
    return blockIdText(block, 0);
  }

  /** The slot holding `nodeId`, or −1. O(log n) positioned reads. */
  async find(nodeId: string): Promise<number> {
    return this.kind === "integer" ? this.findInteger(nodeId) : this.findString(nodeId);
  }

  private async findInteger(nodeId: string): Promise<number> {
    const value = parseU64(nodeId);
    if (value === null) return -1;
    const hi = Number(value >> 32n);
    const lo = Number(value & 0xffffffffn);
    let a = 0;
    let b = this.n;
    while (b - a > INT_WINDOW) {
      const mid = (a + b) >>> 1;
      const w = await this.words(mid, 1);
      const c = compareU64(w[1], w[0], hi, lo);
      if (c === 0) return mid;
      if (c < 0) a = mid + 1;
      else b = mid;
    }
    const w = await this.words(a, b - a);
    for (let i = 0; i < b - a; i++) if (w[2 * i] === lo && w[2 * i + 1] === hi) return a + i;
    return -1;
  }

  private async findString(nodeId: string): Promise<number> {
    const key = Buffer.from(nodeId, "utf8");
    let a = 0;
    let b = this.n;
    while (b - a > STRING_WINDOW) {
      const mid = (a + b) >>> 1;
      const block = await this.idBlock(mid, 1);
      if (block.kind !== "string") throw new Error("unreachable: string index");
      const c = compareBytes(block.bytes, 0, block.bytes.length, key, 0, key.length);
      if (c === 0) return mid;
      if (c < 0) a = mid + 1;
      else b = mid;
    }
    if (b === a) return -1;
    const offsets = await this.offsets(a, b - a);
    const bytes = await this.section(this.header.sections.idBytes, offsets[0], offsets[b - a] - offsets[0]);
    for (let i = 0; i < b - a; i++) {
      if (compareBytes(bytes, offsets[i] - offsets[0], offsets[i + 1] - offsets[0], key, 0, key.length) === 0) return a + i;
    }
    return -1;
  }

  /** Score and rank of `nodeId`, or null when the run has no such node. */
  async lookup(nodeId: string): Promise<{ slot: number; score: number; rank: number } | null> {
    const slot = await this.find(nodeId);
    if (slot < 0) return null;
    const [score, rank] = await Promise.all([this.scores(slot, 1), this.ranks(slot, 1)]);
    return { slot, score: score[0], rank: rank[0] };
  }

  /** Every integer id, ascending (integer indexes only; 8 bytes per node in memory). */
  async integerIds(): Promise<BigUint64Array> {
    if (this.kind !== "integer") throw new Error("integerIds: this index has string ids");
    const b = await this.section(this.header.sections.ids, 0, 8 * this.n);
    return new BigUint64Array(b.buffer, 0, this.n);
  }
}

/** The id at position i of a block, as text. */
export function blockIdText(block: IdBlock, i: number): string {
  if (block.kind === "integer") return ((BigInt(block.words[2 * i + 1]) << 32n) | BigInt(block.words[2 * i])).toString();
  return utf8.decode(block.bytes.subarray(block.offsets[i] - block.base, block.offsets[i + 1] - block.base));
}

/** Exactly `bytes` bytes at `position`, into a fresh buffer (so typed views over it are aligned). */
async function readAt(fh: FileHandle, position: number, bytes: number): Promise<Uint8Array> {
  const out = new Uint8Array(new ArrayBuffer(Math.ceil(bytes / 8) * 8), 0, bytes);
  let done = 0;
  while (done < bytes) {
    const { bytesRead } = await fh.read(out, done, bytes - done, position + done);
    if (bytesRead === 0) throw new ScoreIndexFormatError(`score index ends early: ${bytes - done} bytes missing at ${position + done}`);
    done += bytesRead;
  }
  return out;
}
