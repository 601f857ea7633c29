// Read an edge-list file as chunks of whole lines, gzip or not, fingerprinting the raw bytes on the way.
// Every chunk ends with a newline (one is added after a final unterminated line) and a UTF-8 BOM at the very start is
// dropped, so chunks can be parsed independently and in any order. A line longer than MAX_LINE_BYTES is replaced by
// LONG_LINE_MARK (one short line) so that the parser reports it, with its line number, without holding it in memory.

import { createHash, type Hash } from "node:crypto";
import { createReadStream } from "node:fs";
import { open, type FileHandle } from "node:fs/promises";
import { Transform } from "node:stream";
import { createGunzip, type Gunzip } from "node:zlib";
import { IngestError } from "./errors";
import { MAX_LINE_BYTES } from "./line-parser";
import type { IngestLimits } from "./options";
import { BOM } from "./sniff";

/** Stands in for an over-long line: NUL then 0x01, a line no edge list can contain legitimately. */
export const LONG_LINE_MARK = Uint8Array.of(0, 1);

export interface Chunk {
  seq: number;
  /** Pooled buffer; bytes [0, len) are whole lines. Give it back with release() once parsed. */
  buffer: ArrayBuffer;
  len: number;
}

export class ChunkReader {
  bytesRead = 0;
  readonly gzip: boolean;
  private seq = 0;
  private pool: ArrayBuffer[] = [];
  private cur: Uint8Array;
  private curLen = 0;
  private skipping = false;
  private atStart = true;
  private done = false;
  private readonly hash: Hash = createHash("sha256");
  private inflated = 0;
  private gunzip: Gunzip | null = null;
  private pieces: AsyncIterator<Buffer> | null = null;
  private pending: Buffer | null = null;
  /** Plain files: two read buffers; the next block is read into one while the other is hashed and handed out. */
  private readonly blocks: Buffer[] = [];
  private turn = 0;
  private ahead: Promise<Buffer | null> | null = null;
  private filePos = 0;

  private constructor(
    readonly path: string,
    readonly size: number,
    private readonly fh: FileHandle,
    magic: Uint8Array,
    private readonly limits: IngestLimits,
  ) {
    this.gzip = magic[0] === 0x1f && magic[1] === 0x8b;
    this.cur = new Uint8Array(this.take());
    if (this.gzip) this.startGunzip();
  }

  static async open(path: string, limits: IngestLimits): Promise<ChunkReader> {
    let fh: FileHandle;
    try {
      fh = await open(path, "r");
    } catch (e) {
      throw new IngestError("read-failed", path, `${path}: cannot open (${(e as Error).message})`);
    }
    const { size } = await fh.stat();
    const magic = new Uint8Array(2);
    await fh.read(magic, 0, 2, 0);
    return new ChunkReader(path, size, fh, magic, limits);
  }

  /** sha256 of the raw file bytes; complete once next() returned null. */
  fingerprint(): string {
    return this.hash.copy().digest("hex");
  }

  release(buffer: ArrayBuffer): void {
    if (buffer.byteLength === this.limits.chunkBytes && this.pool.length < 16) this.pool.push(buffer);
  }

  async close(): Promise<void> {
    this.gunzip?.destroy();
    await this.fh.close();
  }

  /** The next chunk of whole lines, or null at the end of the file. */
  async next(): Promise<Chunk | null> {
    while (!this.done) {
      const room = this.cur.length - this.curLen;
      const n = await this.fill(this.cur, this.curLen, room);
      if (n === 0) {
        this.done = true;
        if (this.skipping) this.endSkip(0);
        if (this.curLen > 0 && this.cur[this.curLen - 1] !== 10) this.append(Uint8Array.of(10));
        if (this.curLen > 0) return this.emit(this.curLen);
        return null;
      }
      this.curLen += n;
      if (this.atStart) {
        this.atStart = false;
        if (this.curLen >= 3 && this.cur[0] === BOM[0] && this.cur[1] === BOM[1] && this.cur[2] === BOM[2]) {
          this.cur.copyWithin(0, 3, this.curLen);
          this.curLen -= 3;
        }
      }
      if (this.skipping) {
        const nl = this.cur.subarray(0, this.curLen).indexOf(10);
        if (nl < 0) {
          this.curLen = 0;
          continue;
        }
        this.endSkip(nl);
      }
      const last = this.cur.subarray(0, this.curLen).lastIndexOf(10);
      if (last < 0) {
        if (this.curLen >= this.cur.length) this.growOrSkip();
        continue;
      }
      return this.emit(last + 1);
    }
    return null;
  }

  /** Emit cur[0, cut) and carry the rest into a fresh buffer. */
  private emit(cut: number): Chunk {
    const chunk: Chunk = { seq: this.seq++, buffer: this.cur.buffer as ArrayBuffer, len: cut };
    const next = new Uint8Array(this.take());
    const rest = this.curLen - cut;
    if (rest > 0) next.set(this.cur.subarray(cut, this.curLen));
    this.cur = next;
    this.curLen = rest;
    return chunk;
  }

  /** A line fills the whole buffer: let it grow up to MAX_LINE_BYTES, then replace it with the mark. */
  private growOrSkip(): void {
    const lineStart = this.cur.subarray(0, this.curLen).lastIndexOf(10) + 1;
    if (this.curLen - lineStart < MAX_LINE_BYTES) {
      const bigger = new Uint8Array(this.cur.length * 2);
      bigger.set(this.cur.subarray(0, this.curLen));
      this.cur = bigger;
      return;
    }
    this.curLen = lineStart;
    this.skipping = true;
  }

  /** The over-long line ends at cur[nl]: keep what follows, after the mark. */
  private endSkip(nl: number): void {
    this.skipping = false;
    const tail = this.done ? new Uint8Array(0) : this.cur.slice(nl + 1, this.curLen);
    this.curLen = 0;
    this.append(LONG_LINE_MARK);
    this.append(Uint8Array.of(10));
    this.append(tail);
  }

  private append(bytes: Uint8Array): void {
    if (this.curLen + bytes.length > this.cur.length) {
      const bigger = new Uint8Array(Math.max(this.cur.length * 2, this.curLen + bytes.length));
      bigger.set(this.cur.subarray(0, this.curLen));
      this.cur = bigger;
    }
    this.cur.set(bytes, this.curLen);
    this.curLen += bytes.length;
  }

  private take(): ArrayBuffer {
    return this.pool.pop() ?? new ArrayBuffer(this.limits.chunkBytes);
  }

  /** Up to `room` content bytes into buf at `at`; 0 at the end of the file. */
  private async fill(buf: Uint8Array, at: number, room: number): Promise<number> {
    let n = 0;
    while (n < room) {
      if (!this.pending || this.pending.length === 0) {
        const r = this.gzip ? await this.nextPiece() : await this.nextBlock();
        if (r === null) break;
        this.pending = r;
      }
      const take = Math.min(room - n, this.pending.length);
      buf.set(this.pending.subarray(0, take), at + n);
      this.pending = this.pending.subarray(take);
      n += take;
    }
    return n;
  }

  /**
   * The next block of a plain file, hashed; the read of the block after it starts first, into the other buffer (the
   * one whose bytes were all handed out), so the disk or page cache works while this thread hashes and parses.
   */
  private async nextBlock(): Promise<Buffer | null> {
    const block = await (this.ahead ?? this.readBlock());
    this.ahead = block ? this.readBlock() : null;
    if (block) {
      this.hash.update(block);
      this.bytesRead += block.length;
    }
    return block;
  }

  private async readBlock(): Promise<Buffer | null> {
    const size = this.limits.chunkBytes;
    // Two buffers in turn: the one read into was handed out in full before this read starts.
    this.turn ^= 1;
    this.blocks[this.turn] ??= Buffer.allocUnsafe(size);
    const buf = this.blocks[this.turn];
    const { bytesRead } = await this.fh.read(buf, 0, size, this.filePos);
    this.filePos += bytesRead;
    return bytesRead > 0 ? buf.subarray(0, bytesRead) : null;
  }

  private startGunzip(): void {
    const gunzip = createGunzip({ chunkSize: 1 << 20 });
    const counter = new Transform({
      transform: (piece: Buffer, _enc, cb) => {
        this.hash.update(piece);
        this.bytesRead += piece.length;
        cb(null, piece);
      },
    });
    const input = createReadStream(this.path, { highWaterMark: 1 << 20 });
    input.on("error", (e) => gunzip.destroy(e));
    input.pipe(counter).pipe(gunzip);
    this.gunzip = gunzip;
    this.pieces = gunzip[Symbol.asyncIterator]();
  }

  private async nextPiece(): Promise<Buffer | null> {
    let r: IteratorResult<Buffer>;
    try {
      r = await (this.pieces as AsyncIterator<Buffer>).next();
    } catch (e) {
      if (e instanceof IngestError) throw e;
      throw new IngestError("gzip-corrupt", this.path, `${this.path}: gzip data is corrupt (${(e as Error).message})`);
    }
    if (r.done) return null;
    this.inflated += r.value.length;
    const { maxExpansionRatio, maxDecompressedBytes } = this.limits;
    if (this.inflated > maxDecompressedBytes)
      throw this.bomb(`decompresses to over ${maxDecompressedBytes} bytes (the limit)`);
    if (this.inflated > maxExpansionRatio * this.bytesRead + (1 << 20))
      throw this.bomb(`expands more than ${maxExpansionRatio}x (the limit)`);
    return r.value;
  }

  private bomb(why: string): IngestError {
    this.gunzip?.destroy();
    return new IngestError("gzip-bomb", this.path, `${this.path}: gzip stream ${why}; refusing it`);
  }
}
