// Decide the file's layout from a sample of its first data lines: delimiter, header row, column count, id kind.
// The same decisions then hold for the whole file (every parse thread receives them).

import { isAllDigits, parseWeight } from "./bytes";
import { MAX_FIELDS, splitFields, UNTERMINATED_QUOTE } from "./fields";
import type { Delimiter, GraphOptions } from "./options";

export type IdKind = "integer" | "string";

export interface FileFormat {
  delimiter: Delimiter;
  /** The first non-comment, non-blank line is a header row. */
  header: boolean;
  columns: 2 | 3;
  /** Decided from the sample; a later non-integer id still turns an integer file into a string-id file. */
  idKind: IdKind;
}

const HEADER_WORD =
  /^(source|src|from|target|tgt|dst|dest|destination|to|tail|head|node|id|u|v|origin|citing|cited|follower|followee|weight|w|value|count)([ _-]?(id|node|name))?$/;

export const BOM = [0xef, 0xbb, 0xbf] as const;

export function hasBom(buf: Uint8Array): boolean {
  return buf.length >= 3 && buf[0] === BOM[0] && buf[1] === BOM[1] && buf[2] === BOM[2];
}

/** Data-line candidates (not comments, not blank) of the sample, as [start, end) without newline and CR. */
export function sampleLines(buf: Uint8Array, maxLines: number): Array<[number, number]> {
  const lines: Array<[number, number]> = [];
  let p = hasBom(buf) ? 3 : 0;
  while (p < buf.length && lines.length < maxLines) {
    let nl = buf.indexOf(10, p);
    if (nl < 0) nl = buf.length;
    let e = nl;
    if (e > p && buf[e - 1] === 13) e--;
    let f = p;
    while (f < e && (buf[f] === 32 || buf[f] === 9)) f++;
    if (f < e && buf[f] !== 35 && buf[f] !== 37) lines.push([p, e]);
    p = nl + 1;
  }
  return lines;
}

export function sniffFormat(sample: Uint8Array, options: GraphOptions, maxLines: number): FileFormat {
  const lines = sampleLines(sample, maxLines);
  const delimiter = options.delimiter === "auto" ? detectDelimiter(sample, lines) : options.delimiter;
  const fields = new Int32Array(3 * MAX_FIELDS);
  const rows = lines.map(([s, e]) => {
    const n = splitFields(sample, s, e, delimiter, fields);
    return { n, f: fields.slice() };
  });
  const columns = modalColumns(rows.map((r) => r.n));
  // All digits means an integer id, of any length: one above 2^64 − 1 is then a bad line, as in the parser.
  const isInt = (r: (typeof rows)[number], k: number) => r.n > k && isAllDigits(sample, r.f[3 * k], r.f[3 * k + 1]);
  const isNum = (r: (typeof rows)[number], k: number) => {
    if (r.n <= k) return false;
    const w = parseWeight(sample, r.f[3 * k], r.f[3 * k + 1]);
    return w !== undefined && Number.isFinite(w);
  };
  const word = (r: (typeof rows)[number], k: number) =>
    r.n > k && HEADER_WORD.test(new TextDecoder().decode(sample.subarray(r.f[3 * k], r.f[3 * k + 1])).trim().toLowerCase());

  // Digits in both id fields make the first row data whatever its length or weight, so that a bad first row (an id
  // over 2^64-1, a NaN weight) is reported as a bad line instead of being dropped as a header.
  const digitIds = (r: (typeof rows)[number]) =>
    r.n >= 2 && isAllDigits(sample, r.f[0], r.f[1]) && isAllDigits(sample, r.f[3], r.f[4]);

  let header = false;
  if (options.header !== "auto") header = options.header;
  else if (rows.length > 0) {
    const first = rows[0];
    const rest = rows.slice(1).filter((r) => r.n === columns);
    if (first.n !== UNTERMINATED_QUOTE && word(first, 0) && word(first, 1)) header = true;
    else if (rest.length > 0 && !digitIds(first)) {
      const restInt = rest.every((r) => isInt(r, 0) && isInt(r, 1));
      if (restInt && !(isInt(first, 0) && isInt(first, 1))) header = true;
      else if (columns === 3 && first.n === 3 && !isNum(first, 2) && rest.filter((r) => isNum(r, 2)).length * 2 > rest.length) header = true;
    }
  }
  const data = header ? rows.slice(1) : rows;
  const idKind: IdKind = data.every((r) => r.n !== columns || (isInt(r, 0) && isInt(r, 1))) ? "integer" : "string";
  return { delimiter, header, columns, idKind };
}

/** The more frequent of 2 and 3 fields; a tie goes to the first line's count. */
function modalColumns(counts: number[]): 2 | 3 {
  let two = 0;
  let three = 0;
  for (const c of counts) {
    if (c === 2) two++;
    else if (c === 3) three++;
  }
  if (two === three) return counts[0] === 3 ? 3 : 2;
  return three > two ? 3 : 2;
}

/** The candidate that splits the most sample lines into the same count of 2 or 3 fields; ties go to ",", "\t", " ". */
function detectDelimiter(buf: Uint8Array, lines: Array<[number, number]>): Delimiter {
  const fields = new Int32Array(3 * MAX_FIELDS);
  let best: Delimiter = " ";
  let bestScore = -1;
  for (const d of [",", "\t", " "] as const) {
    const counts = lines.map(([s, e]) => splitFields(buf, s, e, d, fields));
    const modal = modalColumns(counts);
    const score = counts.filter((c) => c === modal).length;
    if (score > bestScore) {
      bestScore = score;
      best = d;
    }
  }
  return best;
}
