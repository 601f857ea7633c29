// Streaming edge-list parser: bytes in (chunks of any size), edge arrays out.
// Ids go through three modes, only ever forward: "raw" (every id so far is an integer below 2^32: the edge arrays
// hold the ids themselves; dense numbering happens once for the whole file), "int" (a larger integer appeared: local
// dense ids from a U64Table) and "string" (a non-integer id appeared: local dense ids from a BytesTable).
// Edge arrays live on SharedArrayBuffers so that graph-build passes on other threads can read them.
// Integer lines take the fast scan; everything unusual goes through one general path that names each bad line's reason.
// Invariants: a bad line adds no node and no edge; self-loops are counted and kept (the graph build applies the policy);
// line numbers are 1-based over every physical line of this parser's range.

import { sharedF64, sharedU32 } from "../graph-store/shared";
import { BytesTable } from "./bytes-table";
import { isAllDigits, isValidUtf8, latin1, parseU64Digits, parseWeight } from "./bytes";
import type { BadLine, BadLineReason } from "./errors";
import { scanIntegerLines, type ScanState } from "./fast-scan";
import { WasmScanner } from "./wasm-scan";
import { scanWideLines } from "./fast-scan-wide";
import { MAX_FIELDS, splitFields, unquote, UNTERMINATED_QUOTE } from "./fields";
import { hasBom, type FileFormat } from "./sniff";
import { U64Table } from "./u64-table";

export const BAD_LINE_SAMPLES = 100;
/** Longest physical line kept across chunk boundaries; a longer line is one bad line. */
export const MAX_LINE_BYTES = 1 << 20;

export type IdMode = "raw" | "int" | "string";

export interface ParserConfig {
  format: FileFormat;
  /** Keep the weight column's values (otherwise they are validated and summarized only). */
  keepWeights: boolean;
  maxFieldBytes: number;
  /** Stop early once more than this many bad lines were seen. */
  maxBadLines: number;
  /** This parser starts at byte 0 of the file (BOM and header row belong to it). */
  atFileStart: boolean;
  /** Size hint for the edge arrays. */
  expectedLines?: number;
  /** Start in "int" mode instead of "raw" (tests use it to compare both paths). */
  hashIds?: boolean;
  /** The compiled WebAssembly scanner for integer lines (see wasm-scan.ts); without it the JS scanner runs. */
  scanModule?: WebAssembly.Module | null;
}

export interface ParseCounts {
  lines: number;
  dataRows: number;
  commentLines: number;
  blankLines: number;
  headerLines: number;
  badLines: number;
  selfLoops: number;
  /** Infinity / -Infinity when the file has no weight column. */
  weightMin: number;
  weightMax: number;
}

/** One parser's output. `src`/`dst` hold raw ids (mode "raw") or indexes into the part's keys. */
export interface ParsedPart {
  mode: IdMode;
  /** mode "raw": largest id seen (-1 when none). */
  maxId: number;
  /** mode "int": key halves by local id. */
  keysLo: Uint32Array | null;
  keysHi: Uint32Array | null;
  /** mode "string": UTF-8 key bytes by local id. */
  keyBytes: Uint8Array | null;
  keyOffsets: Uint32Array | null;
  /** Distinct ids (modes "int" and "string"). */
  nodes: number;
  edges: number;
  src: Uint32Array;
  dst: Uint32Array;
  weight: Float64Array | null;
  counts: ParseCounts;
  bad: BadLine[];
}

export class LineParser {
  readonly bad: BadLine[] = [];
  /** Set once the bad-line count passes maxBadLines; further input is ignored. */
  stopped = false;
  private readonly st: ScanState;
  private intTable: U64Table | null = null;
  /** High id halves of the lines the wide scan just read, indexed from that scan's first edge. */
  private hiSrc = new Uint32Array(0);
  private hiDst = new Uint32Array(0);
  private commentLines = 0;
  private blankLines = 0;
  private headerLines = 0;
  private badLines = 0;
  private strTable: BytesTable | null = null;
  private carry = new Uint8Array(4096);
  private carryLen = 0;
  private carryOverflow = false;
  private startPending: boolean;
  private headerPending: boolean;
  private readonly fields = new Int32Array(3 * MAX_FIELDS);
  private readonly scratch: Uint8Array;
  private readonly wasm: WasmScanner | null;
  private readonly pair = new Uint32Array(4);
  private readonly spans = new Int32Array(4);
  private readonly idBufs: Uint8Array[] = [new Uint8Array(0), new Uint8Array(0)];

  constructor(private readonly cfg: ParserConfig) {
    const lines = Math.max(1024, Math.ceil(cfg.expectedLines ?? 0));
    const threeCols = cfg.format.columns === 3;
    const d = cfg.format.delimiter;
    this.st = {
      delim: d === "," ? 44 : d === "\t" ? 9 : 32,
      threeCols,
      src: sharedU32(lines),
      dst: sharedU32(lines),
      weight: cfg.keepWeights && threeCols ? sharedF64(lines) : null,
      m: 0,
      lines: 0,
      dataRows: 0,
      selfLoops: 0,
      maxId: -1,
      weightMin: Infinity,
      weightMax: -Infinity,
    };
    if (cfg.hashIds) this.intTable = new U64Table(1024);
    this.wasm = cfg.scanModule ? new WasmScanner(cfg.scanModule) : null;
    if (cfg.format.idKind === "string") this.toStrings();
    this.startPending = cfg.atFileStart;
    this.headerPending = cfg.atFileStart && cfg.format.header;
    this.scratch = new Uint8Array(cfg.maxFieldBytes * 4 + 8);
  }

  get mode(): IdMode {
    return this.strTable ? "string" : this.intTable ? "int" : "raw";
  }

  get edgeCount(): number {
    return this.st.m;
  }

  get maxId(): number {
    return this.st.maxId;
  }

  /** The next chunk starts the file: a BOM and the header row (when the format has one) belong to it. */
  beginFile(): void {
    this.startPending = true;
    this.headerPending = this.cfg.format.header;
  }

  get counts(): ParseCounts {
    const st = this.st;
    return {
      lines: st.lines,
      dataRows: st.dataRows,
      commentLines: this.commentLines,
      blankLines: this.blankLines,
      headerLines: this.headerLines,
      badLines: this.badLines,
      selfLoops: st.selfLoops,
      weightMin: st.weightMin,
      weightMax: st.weightMax,
    };
  }

  /** Parse a chunk; bytes after its last newline wait for the next chunk (or end()). */
  feed(chunk: Uint8Array): void {
    if (this.stopped || chunk.length === 0) return;
    let s = 0;
    if (this.startPending) {
      this.startPending = false;
      if (hasBom(chunk)) s = 3;
    }
    if (this.carryLen > 0 || this.carryOverflow) {
      const nl = chunk.indexOf(10, s);
      if (nl < 0) {
        this.appendCarry(chunk, s, chunk.length);
        return;
      }
      this.appendCarry(chunk, s, nl + 1);
      this.flushCarry();
      s = nl + 1;
    }
    const last = chunk.lastIndexOf(10);
    if (last >= s) {
      this.parseLines(chunk, s, last + 1);
      s = last + 1;
    }
    if (s < chunk.length) this.appendCarry(chunk, s, chunk.length);
  }

  /** Parse a final line that has no newline. */
  end(): void {
    if (this.stopped) return;
    if (this.carryLen > 0 || this.carryOverflow) {
      this.appendCarry(Uint8Array.of(10), 0, 1);
      this.flushCarry();
    }
  }

  /** Move to a more general id mode ("raw" → "int" → "string"); used to give all parts of a file one mode. */
  promote(mode: IdMode): void {
    if (mode === "int" && this.mode === "raw") this.toInt();
    else if (mode === "string" && this.mode !== "string") this.toStrings();
  }

  /** Hand over the results (the parser is spent afterwards). */
  finish(): ParsedPart {
    const st = this.st;
    const m = st.m;
    const part: ParsedPart = {
      mode: this.mode,
      maxId: st.maxId,
      keysLo: null,
      keysHi: null,
      keyBytes: null,
      keyOffsets: null,
      nodes: 0,
      edges: m,
      src: st.src.subarray(0, m),
      dst: st.dst.subarray(0, m),
      weight: st.weight ? st.weight.subarray(0, m) : null,
      counts: this.counts,
      bad: this.bad,
    };
    if (this.strTable) {
      part.nodes = this.strTable.size;
      const ex = this.strTable.export();
      part.keyBytes = ex.bytes;
      part.keyOffsets = ex.offsets;
    } else if (this.intTable) {
      part.nodes = this.intTable.size;
      part.keysLo = this.intTable.keysLo.subarray(0, part.nodes);
      part.keysHi = this.intTable.keysHi.subarray(0, part.nodes);
    }
    return part;
  }

  private appendCarry(buf: Uint8Array, s: number, e: number): void {
    if (this.carryOverflow) return;
    const len = e - s;
    if (this.carryLen + len > MAX_LINE_BYTES) {
      this.carryOverflow = true;
      this.carryLen = 0;
      return;
    }
    if (this.carryLen + len > this.carry.length) {
      const bigger = new Uint8Array(Math.max(this.carry.length * 2, this.carryLen + len));
      bigger.set(this.carry.subarray(0, this.carryLen));
      this.carry = bigger;
    }
    this.carry.set(buf.subarray(s, e), this.carryLen);
    this.carryLen += len;
  }

  private flushCarry(): void {
    if (this.carryOverflow) {
      this.carryOverflow = false;
      this.carryLen = 0;
      this.st.lines++;
      this.reject("line-too-long", `over ${MAX_LINE_BYTES} bytes`);
      return;
    }
    const len = this.carryLen;
    this.carryLen = 0;
    this.parseLines(this.carry, 0, len);
  }

  /** buf[s..e) holds whole lines; its last byte is a newline. */
  private parseLines(buf: Uint8Array, s: number, e: number): void {
    const st = this.st;
    let p = s;
    while (p < e && !this.stopped) {
      if (this.strTable === null && !this.headerPending) {
        const m0 = st.m;
        if (this.intTable) {
          const need = Math.ceil((e - p) / 4) + 1;
          if (this.hiSrc.length < need) {
            this.hiSrc = new Uint32Array(need);
            this.hiDst = new Uint32Array(need);
          }
          p = scanWideLines(buf, p, e, st, this.hiSrc, this.hiDst, m0);
          this.mapWide(m0, st.m);
        } else p = this.wasm ? this.wasm.scan(buf, p, e, st) : scanIntegerLines(buf, p, e, st);
        if (p >= e) return;
        if (st.m === st.src.length) {
          this.grow();
          continue;
        }
      }
      const nl = buf.indexOf(10, p);
      st.lines++;
      this.generalLine(buf, p, nl);
      p = nl + 1;
    }
  }

  private grow(): void {
    const st = this.st;
    const cap = Math.ceil(st.src.length * 1.5) + 1024;
    const s = sharedU32(cap);
    s.set(st.src);
    st.src = s;
    const d = sharedU32(cap);
    d.set(st.dst);
    st.dst = d;
    if (st.weight) {
      const w = sharedF64(cap);
      w.set(st.weight);
      st.weight = w;
    }
  }

  private emit(u: number, v: number, w: number): void {
    const st = this.st;
    st.dataRows++;
    if (u === v) st.selfLoops++;
    if (st.m === st.src.length) this.grow();
    st.src[st.m] = u;
    st.dst[st.m] = v;
    if (st.weight) st.weight[st.m] = w;
    st.m++;
    if (st.threeCols) {
      if (w < st.weightMin) st.weightMin = w;
      if (w > st.weightMax) st.weightMax = w;
    }
  }

  /** One line buf[s..nl) (nl is its newline) with every check; st.lines already counts it. */
  private generalLine(buf: Uint8Array, s: number, nl: number): void {
    let e = nl;
    if (e > s && buf[e - 1] === 13) e--;
    let f = s;
    while (f < e && (buf[f] === 32 || buf[f] === 9)) f++;
    if (f === e) {
      this.blankLines++;
      return;
    }
    if (buf[f] === 35 || buf[f] === 37) {
      this.commentLines++;
      return;
    }
    if (this.headerPending) {
      this.headerPending = false;
      this.headerLines++;
      return;
    }
    const nul = buf.subarray(s, e).indexOf(0);
    if (nul >= 0) {
      if (e - s === 2 && buf[s + 1] === 1) return this.reject("line-too-long", `over ${MAX_LINE_BYTES} bytes`);
      return this.reject("nul-byte", `at byte ${nul + 1} of the line`);
    }
    const fields = this.fields;
    const n = splitFields(buf, s, e, this.cfg.format.delimiter, fields);
    if (n === UNTERMINATED_QUOTE) return this.reject("unterminated-quote", "");
    const cols = this.cfg.format.columns;
    if (n !== cols) return this.reject("wrong-column-count", `expected ${cols} columns, found ${n}`);
    const limit = this.cfg.maxFieldBytes;
    const bufs = this.idBufs;
    const spans = this.spans;
    let allDigits = true;
    for (let k = 0; k < 2; k++) {
      let fs = fields[3 * k];
      let fe = fields[3 * k + 1];
      bufs[k] = buf;
      if (fields[3 * k + 2] === 1 && buf.subarray(fs, fe).indexOf(34) >= 0) {
        if (fe - fs > 2 * limit) return this.reject("field-too-long", `field ${k + 1} has over ${limit} bytes; the limit is ${limit}`);
        const into = k === 0 ? this.scratch.subarray(0, 2 * limit + 4) : this.scratch.subarray(2 * limit + 4);
        fe = unquote(buf, fs, fe, into);
        fs = 0;
        bufs[k] = into;
      }
      if (fe === fs) return this.reject("empty-id", `field ${k + 1}`);
      if (fe - fs > limit) return this.reject("field-too-long", `field ${k + 1} has ${fe - fs} bytes; the limit is ${limit}`);
      if (!isValidUtf8(bufs[k], fs, fe)) return this.reject("invalid-utf8", `field ${k + 1}`);
      if (allDigits && !isAllDigits(bufs[k], fs, fe)) allDigits = false;
      spans[2 * k] = fs;
      spans[2 * k + 1] = fe;
    }
    let w = 1;
    if (cols === 3) {
      const ws = fields[6];
      const we = fields[7];
      const parsed = parseWeight(buf, ws, we);
      if (parsed === undefined) return this.reject("bad-weight", quoteText(buf, ws, we));
      if (!Number.isFinite(parsed)) return this.reject("non-finite-weight", quoteText(buf, ws, we));
      if (parsed < 0) return this.reject("negative-weight", quoteText(buf, ws, we));
      w = parsed === 0 ? 0 : parsed;
    }
    if (this.strTable === null && allDigits) {
      const pair = this.pair;
      for (let k = 0; k < 2; k++) {
        if (!parseU64Digits(bufs[k], spans[2 * k], spans[2 * k + 1], pair.subarray(2 * k, 2 * k + 2)))
          return this.reject("id-too-large", `field ${k + 1}`);
      }
      const st = this.st;
      if (this.intTable === null && (pair[1] !== 0 || pair[3] !== 0)) this.toInt();
      if (this.intTable === null) {
        if (pair[0] > st.maxId) st.maxId = pair[0];
        if (pair[2] > st.maxId) st.maxId = pair[2];
        return this.emit(pair[0], pair[2], w);
      }
      return this.emit(this.intTable.idOf(pair[0] | 0, pair[1] | 0), this.intTable.idOf(pair[2] | 0, pair[3] | 0), w);
    }
    if (this.strTable === null) this.toStrings();
    const table = this.strTable as BytesTable;
    this.emit(table.idOf(bufs[0], spans[0], spans[1]), table.idOf(bufs[1], spans[2], spans[3]), w);
  }

  /** Leave "raw" mode: number the ids seen so far by first appearance and rewrite the edge arrays. */
  private toInt(): void {
    this.intTable = new U64Table(Math.min(this.st.m + 16, 1 << 20));
    this.mapRange(0, this.st.m);
  }

  /** Replace the wide scan's (lo, hi) ids in edges [from, to) by local ids. */
  private mapWide(from: number, to: number): void {
    const table = this.intTable as U64Table;
    const { src, dst } = this.st;
    const { hiSrc, hiDst } = this;
    for (let i = from; i < to; i++) {
      src[i] = table.idOf(src[i] | 0, hiSrc[i - from] | 0);
      dst[i] = table.idOf(dst[i] | 0, hiDst[i - from] | 0);
    }
  }

  /** Replace raw ids (below 2^32) in edges [from, to) by local ids. */
  private mapRange(from: number, to: number): void {
    const table = this.intTable as U64Table;
    const { src, dst } = this.st;
    for (let i = from; i < to; i++) {
      src[i] = table.idOf(src[i] | 0, 0);
      dst[i] = table.idOf(dst[i] | 0, 0);
    }
  }

  /**
   * A non-integer id: from here on this is a string-id file. Integer ids already seen become their canonical decimal
   * text (an earlier "007" is now "7"); local ids do not change.
   */
  private toStrings(): void {
    if (this.intTable === null) this.toInt();
    const ints = this.intTable as U64Table;
    const strs = new BytesTable(Math.max(1024, ints.size * 2), ints.size * 12);
    const enc = new TextEncoder();
    for (let id = 0; id < ints.size; id++) {
      const hi = ints.keysHi[id];
      const text = hi === 0 ? String(ints.keysLo[id]) : ((BigInt(hi) << 32n) | BigInt(ints.keysLo[id])).toString();
      const bytes = enc.encode(text);
      strs.idOf(bytes, 0, bytes.length);
    }
    this.intTable = null;
    this.strTable = strs;
  }

  private reject(reason: BadLineReason, detail: string): void {
    this.badLines++;
    if (this.bad.length < BAD_LINE_SAMPLES) this.bad.push({ line: this.st.lines, reason, detail });
    if (this.badLines > this.cfg.maxBadLines) this.stopped = true;
  }
}

function quoteText(buf: Uint8Array, s: number, e: number): string {
  const text = latin1(buf, s, Math.min(e, s + 40));
  return JSON.stringify(e - s > 40 ? `${text}…` : text);
}
