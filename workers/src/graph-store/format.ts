// The prepared graph on disk: one directory holding
//   meta.json                    counts, options, statistics, input fingerprint, format version, and every file's size
//                                and sha256
//   ids.u64                      integer ids: u64 little-endian, one per dense node
//   ids.bytes + ids.offsets.u32  string ids: UTF-8 bytes; offsets (n+1) into them
//   out-weight.f64               W_u per dense node
//   piece-NNNN.offsets.u32       in-edge CSR of targets [start, end): end-start+1 offsets, the first 0
//   piece-NNNN.sources.u32       source of each in-edge, ascending inside each target's list
//   piece-NNNN.weights.f64       edge weights (only for weighted graphs)
// Pieces are contiguous target ranges balanced by edge count, cut on BLOCK_NODES boundaries.

import { BLOCK_NODES } from "../core/graph";

export const STORE_FORMAT = "stillpoint-graph";
export const STORE_VERSION = 1;

export interface StoredFile {
  name: string;
  bytes: number;
  sha256: string;
}

export interface StoredPiece {
  index: number;
  start: number;
  end: number;
  edges: number;
  offsets: StoredFile;
  sources: StoredFile;
  weights: StoredFile | null;
}

export interface StoreMeta {
  format: typeof STORE_FORMAT;
  version: number;
  createdAt: string;
  n: number;
  m: number;
  /** Present when merged duplicates are stored as repeated sources: the edge count after merging (see Graph). */
  mergedEdges?: number;
  idKind: "integer" | "string";
  weighted: boolean;
  /** sha256 of the uploaded edge-list file. */
  fingerprint: string | null;
  /** Graph options and ingest statistics, stored as given. */
  options: Record<string, unknown>;
  stats: Record<string, unknown>;
  files: { ids: StoredFile; idOffsets: StoredFile | null; outWeight: StoredFile };
  pieces: StoredPiece[];
}

export class GraphStoreError extends Error {
  override readonly name = "GraphStoreError";
  constructor(
    readonly code: "missing" | "version" | "corrupt",
    readonly dir: string,
    message: string,
  ) {
    super(`graph store ${dir}: ${message}`);
  }
}

export function pieceName(index: number, kind: "offsets.u32" | "sources.u32" | "weights.f64"): string {
  return `piece-${String(index).padStart(4, "0")}.${kind}`;
}

/** Default piece count: about 8M edges a piece, at least one, at most one per block. */
export function defaultPieces(n: number, m: number): number {
  return Math.max(1, Math.min(256, Math.ceil(m / 8_000_000), Math.ceil(n / BLOCK_NODES)));
}

/**
 * Cut 0..n into at most `count` non-empty contiguous ranges on multiples of blockNodes, boundary i at the block edge
 * where the in-edge prefix first reaches i/count of all edges.
 */
export function planPieces(inOffsets: Uint32Array, n: number, count: number, blockNodes = BLOCK_NODES): Array<{ start: number; end: number }> {
  if (n === 0) return [];
  const blocks = Math.ceil(n / blockNodes);
  const m = inOffsets[n];
  const cuts = [0];
  for (let i = 1; i < count; i++) {
    const target = (m * i) / count;
    let lo = cuts[cuts.length - 1] + 1;
    let hi = blocks;
    while (lo < hi) {
      const mid = (lo + hi) >>> 1;
      if (inOffsets[Math.min(mid * blockNodes, n)] < target) lo = mid + 1;
      else hi = mid;
    }
    if (lo < blocks) cuts.push(lo);
  }
  cuts.push(blocks);
  const out: Array<{ start: number; end: number }> = [];
  for (let i = 0; i + 1 < cuts.length; i++) {
    if (cuts[i + 1] > cuts[i]) out.push({ start: Math.min(cuts[i] * blockNodes, n), end: Math.min(cuts[i + 1] * blockNodes, n) });
  }
  return out;
}
