// From parsed parts to canonical node ids: node c (0..n-1) is the c-th smallest original id (integers by value, strings
// by UTF-8 bytes). Numbering by id rather than by first appearance makes the graph a function of the set of lines,
// whatever their order or the number of parse threads.
// Raw parts (every id an integer below 2^32) use a direct table indexed by id when the id range is small enough;
// otherwise ids go through hash tables: one per part during the parse, merged here.

import type { NodeIds } from "../core/graph";
import { LOCAL_RUNNER, type PassRunner } from "../graph-store/build";
import { assemblyModule } from "../tasks/assembly";
import { sharedU32 } from "../graph-store/shared";
import { BytesTable } from "./bytes-table";
import type { IdMode, ParsedPart } from "./line-parser";
import { U64Table } from "./u64-table";

/** Edges of one part; the canonical id of a stored value x is map[x]. */
export interface EdgeSegment {
  src: Uint32Array;
  dst: Uint32Array;
  weight: Float64Array | null;
  map: Uint32Array;
}

export interface CanonicalEdges {
  n: number;
  ids: NodeIds;
  segments: EdgeSegment[];
  /** Arc counts by canonical id under the policy, when numbering already counted them. */
  degrees?: ArcCounts | null;
  /** Shared tables the numbering is done with, already in memory: the build may write over them. */
  spare?: Uint32Array[];
}

/** Arcs per node after the self-loop policy and undirected doubling, before duplicates merge. */
export interface ArcCounts {
  out: Uint32Array;
  in: Uint32Array;
  arcs: number;
  selfLoopsDropped: number;
}

export interface CountPolicy {
  directed: boolean;
  dropSelfLoops: boolean;
}

export interface Numbering {
  n: number;
  /** Original ids in canonical order. */
  ids: NodeIds;
  /** maps[k][x]: canonical id of value x stored by part k. */
  maps: Uint32Array[];
  /** How ids were numbered: a direct table indexed by id value, or hash tables. */
  idPath: "direct" | "hash";
  /** Counted on the way (direct path only). */
  degrees: ArcCounts | null;
  /** Count tables the numbering is done with (direct path): see CanonicalEdges.spare. */
  spare?: Uint32Array[];
}

/** Largest id range numbered with direct tables (12 bytes per possible id value, transient). */
export function directLimit(edges: number): number {
  return Math.max(1 << 24, Math.min(2 * edges, 2 ** 31));
}

/** The mode every part must be in before assembling: the most general one any part reached. */
export function commonMode(modes: IdMode[]): IdMode {
  if (modes.includes("string")) return "string";
  if (modes.includes("int")) return "int";
  return "raw";
}

/** Canonical numbering for parts that are all "raw", all "int" or all "string". */
export async function numberNodes(
  parts: ParsedPart[],
  policy: CountPolicy,
  runner: PassRunner = LOCAL_RUNNER,
  /** Called once the worker threads are done with the numbering (the rest of it runs on this thread). */
  onThreadsFree: () => void = () => {},
): Promise<Numbering> {
  const mode = commonMode(parts.map((p) => p.mode));
  if (parts.some((p) => p.mode !== mode)) throw new Error("numberNodes: parts must share one id mode");
  if (mode === "raw") return assembleRaw(parts, policy, runner, onThreadsFree);
  onThreadsFree();
  if (mode === "int") return assembleInt(parts);
  return assembleStrings(parts);
}

/**
 * Direct path: one pass counts lines by id value (as source, as target, as self-loop); a value is a node when it
 * occurs at all (a node seen only in a dropped self-loop stays, as a dangling node). Arc counts per policy:
 * directed out = sources − dropped self-loops (in likewise); undirected out = in = sources + targets − self-loops
 * counted twice (dropped) or once (kept, an undirected self-loop is one arc).
 */
async function assembleRaw(parts: ParsedPart[], policy: CountPolicy, runner: PassRunner, onThreadsFree: () => void): Promise<Numbering> {
  const maxId = Math.max(-1, ...parts.map((p) => p.maxId));
  const edges = parts.reduce((s, p) => s + p.edges, 0);
  const hasSelf = parts.some((p) => p.counts.selfLoops > 0);
  // Count slices each need their own tables: only worth it while a table is small next to the edge arrays.
  const slices = maxId + 1 <= edges ? Math.max(1, Math.min(runner.slices, parts.length)) : 1;
  const tables = Array.from({ length: slices }, () => ({
    outRaw: sharedU32(maxId + 1),
    inRaw: sharedU32(maxId + 1),
    selfRaw: hasSelf ? sharedU32(maxId + 1) : null,
  }));
  const bySlice: Array<Array<{ src: Uint32Array; dst: Uint32Array }>> = tables.map(() => []);
  parts.forEach((p, k) => bySlice[k % slices].push({ src: p.src, dst: p.dst }));
  // Worker lanes count in WebAssembly.
  const lanes = runner === LOCAL_RUNNER ? undefined : assemblyModule("lane-passes");
  await runner.run(tables.map((t, k) => ({ kind: "count" as const, task: { edges: bySlice[k], ...t, lanes } })));
  onThreadsFree();
  // Tables beyond the second fold into it first (more than two count threads); the first two are summed on the way.
  const [first, second = null] = tables;
  for (const t of tables.slice(2)) {
    const into = second as (typeof tables)[number];
    for (let x = 0; x <= maxId; x++) {
      into.outRaw[x] += t.outRaw[x];
      into.inRaw[x] += t.inRaw[x];
    }
    if (into.selfRaw && t.selfRaw) for (let x = 0; x <= maxId; x++) into.selfRaw[x] += t.selfRaw[x];
  }
  const { outRaw, inRaw, selfRaw } = first;
  const outRaw2 = second?.outRaw ?? null;
  const inRaw2 = second?.inRaw ?? null;
  const selfRaw2 = second?.selfRaw ?? null;
  // The loop reads value x's counts and then writes node c ≤ x's degrees and map[x]: so the degrees go over the first
  // table in place and the map over the second's out-counts (memory already in RAM; fresh pages cost about 3 ms a MB
  // here). Room for every value; only the first n slots of the others are written (untouched room costs no memory).
  const map = outRaw2 ?? sharedU32(maxId + 1);
  const idsRoom = new BigUint64Array(maxId + 1);
  // Ids below 2^32 written as the low words of the 64-bit slots (no BigInt per node; the high words stay 0).
  const idWords = new Uint32Array(idsRoom.buffer);
  const selfPerArc = policy.directed ? (policy.dropSelfLoops ? 1 : 0) : policy.dropSelfLoops ? 2 : 1;
  let arcs = 0;
  let dropped = 0;
  let c = 0;
  for (let x = 0; x <= maxId; x++) {
    let o = outRaw[x];
    let i = inRaw[x];
    if (outRaw2 !== null && inRaw2 !== null) {
      o += outRaw2[x];
      i += inRaw2[x];
    }
    if (o === 0 && i === 0) continue;
    const self = (selfRaw ? selfRaw[x] : 0) + (selfRaw2 ? selfRaw2[x] : 0);
    if (policy.dropSelfLoops) dropped += self;
    if (policy.directed) {
      outRaw[c] = o - selfPerArc * self;
      inRaw[c] = i - selfPerArc * self;
    } else {
      outRaw[c] = o + i - selfPerArc * self;
      inRaw[c] = outRaw[c];
    }
    arcs += outRaw[c];
    map[x] = c;
    idWords[2 * c++] = x;
  }
  const n = c;
  const ids = idsRoom.subarray(0, n);
  const out = outRaw.subarray(0, n);
  const inn = inRaw.subarray(0, n);
  return {
    n,
    ids: { kind: "integer", ids },
    maps: parts.map(() => map),
    idPath: "direct",
    degrees: { out, in: inn, arcs, selfLoopsDropped: dropped },
    spare: [inRaw2, selfRaw, selfRaw2, ...tables.slice(2).flatMap((t) => [t.outRaw, t.inRaw, t.selfRaw])].filter((t): t is Uint32Array => t !== null),
  };
}

function assembleInt(parts: ParsedPart[]): Numbering {
  const total = parts.reduce((s, p) => s + p.nodes, 0);
  const table = new U64Table(Math.max(1024, Math.min(total, 1 << 26)));
  const globalOf = parts.map((p) => {
    const g = new Uint32Array(p.nodes);
    const lo = p.keysLo as Uint32Array;
    const hi = p.keysHi as Uint32Array;
    for (let i = 0; i < p.nodes; i++) g[i] = table.idOf(lo[i] | 0, hi[i] | 0);
    return g;
  });
  const n = table.size;
  const sorted = table.toBigIds().sort();
  const rank = new Uint32Array(n);
  for (let c = 0; c < n; c++) {
    const k = sorted[c];
    rank[table.find(Number(k & 0xffff_ffffn) | 0, Number(k >> 32n) | 0)] = c;
  }
  return {
    n,
    ids: { kind: "integer", ids: sorted },
    maps: globalOf.map((g) => compose(rank, g)),
    idPath: "hash",
    degrees: null,
  };
}

function assembleStrings(parts: ParsedPart[]): Numbering {
  const total = parts.reduce((s, p) => s + p.nodes, 0);
  const bytesTotal = parts.reduce((s, p) => s + (p.keyBytes?.length ?? 0), 0);
  const table = new BytesTable(Math.max(1024, total), bytesTotal);
  const globalOf = parts.map((p) => {
    const g = new Uint32Array(p.nodes);
    const bytes = p.keyBytes as Uint8Array;
    const off = p.keyOffsets as Uint32Array;
    for (let i = 0; i < p.nodes; i++) g[i] = table.idOf(bytes, off[i], off[i + 1]);
    return g;
  });
  const n = table.size;
  const { bytes, offsets } = table.export();
  const order = new Uint32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  order.sort((a, b) => compareBytes(bytes, offsets[a], offsets[a + 1], offsets[b], offsets[b + 1]));
  const rank = new Uint32Array(n);
  const outOffsets = new Uint32Array(n + 1);
  const outBytes = new Uint8Array(bytes.length);
  for (let c = 0; c < n; c++) {
    const g = order[c];
    rank[g] = c;
    const len = offsets[g + 1] - offsets[g];
    outBytes.set(bytes.subarray(offsets[g], offsets[g + 1]), outOffsets[c]);
    outOffsets[c + 1] = outOffsets[c] + len;
  }
  return {
    n,
    ids: { kind: "string", bytes: outBytes, offsets: outOffsets },
    maps: globalOf.map((g) => compose(rank, g)),
    idPath: "hash",
    degrees: null,
  };
}

function compose(outer: Uint32Array, inner: Uint32Array): Uint32Array {
  const r = sharedU32(inner.length);
  for (let i = 0; i < inner.length; i++) r[i] = outer[inner[i]];
  return r;
}

export function compareBytes(buf: Uint8Array, as: number, ae: number, bs: number, be: number): number {
  const la = ae - as;
  const lb = be - bs;
  const l = Math.min(la, lb);
  for (let i = 0; i < l; i++) {
    const d = buf[as + i] - buf[bs + i];
    if (d !== 0) return d;
  }
  return la - lb;
}
