// Why a line or a whole file was rejected. Reasons are stable codes; messages are for people.

export const BAD_LINE_REASONS = {
  "wrong-column-count": "wrong number of columns",
  "empty-id": "empty id",
  "id-too-large": "integer id over 2^64-1",
  "field-too-long": "field longer than the id length limit",
  "invalid-utf8": "invalid UTF-8",
  "nul-byte": "NUL byte in line",
  "unterminated-quote": "unterminated quoted field",
  "bad-weight": "weight is not a number",
  "negative-weight": "negative weight",
  "non-finite-weight": "weight is NaN or infinite",
  "line-too-long": "line longer than the line length limit",
} as const;

export type BadLineReason = keyof typeof BAD_LINE_REASONS;
export const REASON_CODES = Object.keys(BAD_LINE_REASONS) as BadLineReason[];

export interface BadLine {
  /** 1-based physical line number (every newline counts, comments and blank lines included). */
  line: number;
  reason: BadLineReason;
  /** Human detail, e.g. "expected 2 columns, found 3". */
  detail: string;
}

export type IngestErrorCode =
  | "empty-file"
  | "no-data"
  | "header-only"
  | "too-many-bad-lines"
  | "no-edges"
  | "too-large"
  | "gzip-bomb"
  | "gzip-corrupt"
  | "read-failed";

/** A file-level failure: names the file, and for bad-line failures the first bad line and its reason. */
export class IngestError extends Error {
  override readonly name = "IngestError";
  constructor(
    readonly code: IngestErrorCode,
    readonly file: string,
    message: string,
    readonly firstBadLine: BadLine | null = null,
    readonly badLines: BadLine[] = [],
    readonly badLineCount = 0,
  ) {
    super(message);
  }
}

export function describeBadLine(b: BadLine): string {
  return `line ${b.line}: ${BAD_LINE_REASONS[b.reason]}${b.detail ? ` (${b.detail})` : ""}`;
}
