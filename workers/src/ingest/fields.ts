// Split one line (without its newline and trailing CR) into fields.
// "," : fields separated by commas; spaces/tabs around a field are trimmed; a field may be double-quoted, with ""
//       standing for one quote inside it. "\t": fields separated by single tabs, spaces trimmed, no quoting.
// " " : fields separated by runs of spaces and tabs; leading and trailing whitespace ignored.

import type { Delimiter } from "./options";

/** Fields recorded per line (a line with more still reports its full count). */
export const MAX_FIELDS = 4;
export const UNTERMINATED_QUOTE = -1;

/**
 * Fills out[3i] = start, out[3i+1] = end, out[3i+2] = 1 when quoted (content between the quotes, escapes intact)
 * for the first MAX_FIELDS fields and returns the field count, or UNTERMINATED_QUOTE.
 */
export function splitFields(buf: Uint8Array, s: number, e: number, delimiter: Delimiter, out: Int32Array): number {
  if (delimiter === " ") return splitWhitespace(buf, s, e, out);
  const d = delimiter === "," ? 44 : 9;
  const quoting = d === 44;
  let n = 0;
  let p = s;
  for (;;) {
    while (p < e && (buf[p] === 32 || (buf[p] === 9 && d !== 9))) p++;
    let fs: number;
    let fe: number;
    let quoted = 0;
    if (quoting && p < e && buf[p] === 34) {
      fs = ++p;
      for (;;) {
        if (p >= e) return UNTERMINATED_QUOTE;
        if (buf[p] === 34) {
          if (p + 1 < e && buf[p + 1] === 34) p += 2;
          else break;
        } else p++;
      }
      fe = p++;
      quoted = 1;
      while (p < e && (buf[p] === 32 || buf[p] === 9)) p++;
      if (p < e && buf[p] !== d) {
        // Text after a closing quote: keep the whole raw field so the caller reports it as one odd field.
        while (p < e && buf[p] !== d) p++;
        fs = fs - 1;
        fe = p;
        quoted = 0;
      }
    } else {
      fs = p;
      while (p < e && buf[p] !== d) p++;
      fe = p;
      while (fe > fs && (buf[fe - 1] === 32 || (buf[fe - 1] === 9 && d !== 9))) fe--;
    }
    if (n < MAX_FIELDS) {
      out[3 * n] = fs;
      out[3 * n + 1] = fe;
      out[3 * n + 2] = quoted;
    }
    n++;
    if (p >= e) return n;
    p++; // past the delimiter
  }
}

function splitWhitespace(buf: Uint8Array, s: number, e: number, out: Int32Array): number {
  let n = 0;
  let p = s;
  for (;;) {
    while (p < e && (buf[p] === 32 || buf[p] === 9)) p++;
    if (p >= e) return n;
    const fs = p;
    while (p < e && buf[p] !== 32 && buf[p] !== 9) p++;
    if (n < MAX_FIELDS) {
      out[3 * n] = fs;
      out[3 * n + 1] = p;
      out[3 * n + 2] = 0;
    }
    n++;
  }
}

/** Copy a quoted field's content with "" collapsed to ", into scratch; returns the length. */
export function unquote(buf: Uint8Array, s: number, e: number, scratch: Uint8Array): number {
  let n = 0;
  for (let p = s; p < e; p++) {
    scratch[n++] = buf[p];
    if (buf[p] === 34) p++;
  }
  return n;
}
