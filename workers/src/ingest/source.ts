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
  /** Bytes cur[0, hashed) are in the fingerprint (or were added here, not read). */
  private hashed = 0;
  /** Plain files: the read into cur at curLen, started when the previous chunk was emitted. */
  private ahead: Promise<number> | null = null;
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
          this.hashPending();
          this.cur.copyWithin(0, 3, this.curLen);
          this.curLen -= 3;
          this.hashed = this.curLen;
        }
      }
      if (this.skipping) {
        const nl = this.cur.subarray(0, this.curLen).indexOf(10);
        if (nl < 0) {
          this.hashPending();
          this.curLen = 0;
          this.hashed = 0;
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

  /**
   * Emit cur[0, cut) and carry the rest into a fresh buffer. A plain file's next read, straight into that buffer,
   * starts before this chunk's bytes are hashed, so the disk or page cache works while this thread hashes.
   */
  private emit(cut: number): Chunk {
    const done = this.cur;
    const doneLen = this.curLen;
    const chunk: Chunk = { seq: this.seq++, buffer: done.buffer as ArrayBuffer, len: cut };
    const next = new Uint8Array(this.take());
    const rest = doneLen - cut;
    if (rest > 0) next.set(done.subarray(cut, doneLen));
    this.cur = next;
    this.curLen = rest;
    if (!this.gzip && !this.done) {
      this.ahead = this.readPlain(next, rest, next.length - rest);
      // Awaited by the next fill; if the ingest stops first, its failure must not surface on its own.
      this.ahead.catch(() => {});
    }
    // A gzip file's fingerprint is taken over its compressed bytes as they are read (see startGunzip).
    if (!this.gzip && this.hashed < doneLen) this.hash.update(done.subarray(this.hashed, doneLen));
    this.hashed = rest;
    return chunk;
  }

  /** Fingerprint the bytes of cur read but not hashed yet (before they are dropped or rewritten). */
  private hashPending(): void {
    if (!this.gzip && this.hashed < this.curLen) this.hash.update(this.cur.subarray(this.hashed, this.curLen));
    this.hashed = this.curLen;
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
    this.hashPending();
    this.curLen = lineStart;
    this.hashed = lineStart;
    this.skipping = true;
  }

  /** The over-long line ends at cur[nl]: keep what follows, after the mark. */
  private endSkip(nl: number): void {
    this.hashPending();
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
    this.hashPending();
    this.cur.set(bytes, this.curLen);
    this.curLen += bytes.length;
    // Added here, not read: never part of the fingerprint.
    this.hashed = this.curLen;
  }

  private take(): ArrayBuffer {
    return this.pool.pop() ?? new ArrayBuffer(this.limits.chunkBytes);
  }

  /** Up to `room` content bytes into buf at `at`; 0 at the end of the file. Plain files are hashed at emit(). */
  private async fill(buf: Uint8Array, at: number, room: number): Promise<number> {
    if (!this.gzip) {
      const ahead = this.ahead;
      this.ahead = null;
      // A read started at emit() went to exactly this buffer, offset and room.
      return ahead ? await ahead : await this.readPlain(buf, at, room);
    }
    let n = 0;
    while (n < room) {
      if (!this.pending || this.pending.length === 0) {
        const r = await this.nextPiece();
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

  private async readPlain(buf: Uint8Array, at: number, room: number): Promise<number> {
    const { bytesRead } = await this.fh.read(buf, at, room, this.filePos);
    this.filePos += bytesRead;
    this.bytesRead += bytesRead;
    return bytesRead;
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
