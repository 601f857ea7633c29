// Ingest options: what the user chooses (graph options) and what the operator bounds (limits).

export type Delimiter = "," | "\t" | " ";

/** The graph options a user states for an upload; defaults first. */
export interface GraphOptions {
  directed: boolean;
  weighted: boolean;
  selfLoops: "drop" | "keep";
  duplicates: "merge" | "keep";
  header: "auto" | boolean;
  delimiter: "auto" | Delimiter;
  maxBadLines: number;
}

export const DEFAULT_GRAPH_OPTIONS: Readonly<GraphOptions> = Object.freeze({
  directed: true,
  weighted: false,
  selfLoops: "drop",
  duplicates: "merge",
  header: "auto",
  delimiter: "auto",
  maxBadLines: 0,
});

/** Operator limits: resource bounds and parallelism, not part of the graph's meaning. */
export interface IngestLimits {
  /** Longest accepted id field, in bytes. */
  maxFieldBytes: number;
  /** Gzip guard: decompressed bytes may not exceed this multiple of the compressed bytes read so far. */
  maxExpansionRatio: number;
  /** Gzip guard: absolute cap on decompressed bytes. */
  maxDecompressedBytes: number;
  /** Worker threads for parsing and building (gzip is decompressed on the calling thread). 0 = one per core, at most 8. */
  threads: number;
  /** Data lines read up front to decide delimiter, header, column count and id kind. */
  sampleLines: number;
  /** Bytes per read. */
  chunkBytes: number;
  /** Inputs with fewer text bytes (gzip counted as 4× its size) are ingested on the calling thread alone. */
  parallelMinBytes: number;
}

export const DEFAULT_LIMITS: Readonly<IngestLimits> = Object.freeze({
  maxFieldBytes: 1024,
  maxExpansionRatio: 200,
  maxDecompressedBytes: 256 * 2 ** 30,
  threads: 0,
  sampleLines: 1000,
  chunkBytes: 4 * 2 ** 20,
  parallelMinBytes: 16 * 2 ** 20,
});

/** Merge user options over the defaults and reject impossible values with a RangeError naming the option. */
export function resolveGraphOptions(partial: Partial<GraphOptions> = {}): GraphOptions {
  const o: GraphOptions = { ...DEFAULT_GRAPH_OPTIONS, ...stripUndefined(partial) };
  if (typeof o.directed !== "boolean") throw new RangeError(`directed must be a boolean. Value: ${String(o.directed)}`);
  if (typeof o.weighted !== "boolean") throw new RangeError(`weighted must be a boolean. Value: ${String(o.weighted)}`);
  if (o.selfLoops !== "drop" && o.selfLoops !== "keep")
    throw new RangeError(`selfLoops must be "drop" or "keep". Value: ${String(o.selfLoops)}`);
  if (o.duplicates !== "merge" && o.duplicates !== "keep")
    throw new RangeError(`duplicates must be "merge" or "keep". Value: ${String(o.duplicates)}`);
  if (o.header !== "auto" && typeof o.header !== "boolean")
    throw new RangeError(`header must be "auto", true or false. Value: ${String(o.header)}`);
  if (!["auto", ",", "\t", " "].includes(o.delimiter))
    throw new RangeError(`delimiter must be "auto", ",", "\\t" or " ". Value: ${JSON.stringify(o.delimiter)}`);
  if (!Number.isSafeInteger(o.maxBadLines) || o.maxBadLines < 0)
    throw new RangeError(`maxBadLines must be a non-negative integer. Value: ${String(o.maxBadLines)}`);
  return o;
}

export function resolveLimits(partial: Partial<IngestLimits> = {}): IngestLimits {
  const l: IngestLimits = { ...DEFAULT_LIMITS, ...stripUndefined(partial) };
  for (const [k, v] of Object.entries(l)) {
    if (typeof v !== "number" || !Number.isFinite(v) || v < 0) throw new RangeError(`${k} must be a non-negative number. Value: ${String(v)}`);
  }
  if (l.maxFieldBytes < 1) throw new RangeError(`maxFieldBytes must be at least 1. Value: ${l.maxFieldBytes}`);
  if (l.sampleLines < 1) throw new RangeError(`sampleLines must be at least 1. Value: ${l.sampleLines}`);
  if (l.chunkBytes < 4096) throw new RangeError(`chunkBytes must be at least 4096. Value: ${l.chunkBytes}`);
  return l;
}

function stripUndefined<T extends object>(o: T): Partial<T> {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;
}
