// Writing a score index from a run's ids and scores (the runner) or from its Arrow score file (older runs).
import { createHash } from "node:crypto";
import type { NodeIds } from "../core/graph";
import { writeAtomic } from "../output/atomic-file";
import { ranks as ranksOf } from "../output/rank-order";
import { encodePrefix, sectionLayout, SCORE_INDEX_VERSION, type ScoreIndexHeader } from "./format";
import { logHistogram } from "./histogram";
import { sortedIdOrder } from "./id-order";

export interface ScoreIndexInput {
  /** ids of nodes 0..n−1 in any fixed order, with their scores in the same order. */
  ids: NodeIds;
  scores: Float64Array;
  /** Ranks in the same order (1 = highest); computed from the scores (ties by position) when absent. */
  ranks?: Uint32Array;
}

// The id order depends only on the graph: consecutive runs on one loaded graph sort its ids once.
const permCache = new WeakMap<NodeIds, Uint32Array>();

function idPermutation(ids: NodeIds): Uint32Array {
  let perm = permCache.get(ids);
  if (!perm) {
    perm = sortedIdOrder(ids);
    permCache.set(ids, perm);
  }
  return perm;
}

function idCount(ids: NodeIds): number {
  return ids.kind === "integer" ? ids.ids.length : ids.offsets.length - 1;
}

const bytesOf = (a: ArrayBufferView) => new Uint8Array(a.buffer, a.byteOffset, a.byteLength);

/** The id sections in slot order: ids (uint64, or uint32 offsets) and idBytes. */
function idSections(ids: NodeIds, perm: Uint32Array): { ids: Uint8Array; idBytes: Uint8Array } {
  const n = perm.length;
  if (ids.kind === "integer") {
    const from = new Uint32Array(ids.ids.buffer, ids.ids.byteOffset, 2 * n);
    const to = new Uint32Array(2 * n);
    for (let s = 0; s < n; s++) {
      const v = perm[s];
      to[2 * s] = from[2 * v];
      to[2 * s + 1] = from[2 * v + 1];
    }
    return { ids: bytesOf(to), idBytes: new Uint8Array(0) };
  }
  const offsets = new Uint32Array(n + 1);
  for (let s = 0; s < n; s++) offsets[s + 1] = offsets[s] + (ids.offsets[perm[s] + 1] - ids.offsets[perm[s]]);
  const bytes = new Uint8Array(offsets[n]);
  for (let s = 0; s < n; s++) bytes.set(ids.bytes.subarray(ids.offsets[perm[s]], ids.offsets[perm[s] + 1]), offsets[s]);
  return { ids: bytesOf(offsets), idBytes: bytes };
}

/**
 * The index file's parts in order (prefix, then each section padded to 8 bytes) and its header.
 * @example buildScoreIndex({ ids: { kind: "integer", ids: BigUint64Array.of(7n, 3n) }, scores: Float64Array.of(0.4, 0.6) })
 */
export function buildScoreIndex(input: ScoreIndexInput): { header: ScoreIndexHeader; parts: Uint8Array[] } {
  const { ids, scores } = input;
  const n = scores.length;
  if (idCount(ids) !== n) throw new RangeError(`ids must name ${n} nodes, one per score. Value: ${idCount(ids)}`);
  const rank = input.ranks ?? ranksOf(scores);
  if (rank.length !== n) throw new RangeError(`ranks must have ${n} entries. Value: ${rank.length}`);
  const perm = idPermutation(ids);
  const sortedIds = idSections(ids, perm);
  const scoreBySlot = new Float64Array(n);
  const rankBySlot = new Uint32Array(n);
  const order = new Uint32Array(n);
  const seen = new Uint8Array(n);
  for (let s = 0; s < n; s++) {
    const v = perm[s];
    const r = rank[v];
    if (!(r >= 1 && r <= n) || seen[r - 1]) throw new RangeError(`ranks must be a permutation of 1..${n}. Value: ${r} at ${v}`);
    seen[r - 1] = 1;
    scoreBySlot[s] = scores[v];
    rankBySlot[s] = r;
    order[r - 1] = s;
  }
  const digest = createHash("sha256").update(sortedIds.ids).update(sortedIds.idBytes).digest("hex");
  const sections = sectionLayout(ids.kind, n, sortedIds.idBytes.length);
  const header: ScoreIndexHeader = { version: SCORE_INDEX_VERSION, kind: ids.kind, n, digest, sections, histogram: logHistogram(scores) };
  const parts: Uint8Array[] = [encodePrefix(header)];
  const bodies = [sortedIds.ids, sortedIds.idBytes, bytesOf(scoreBySlot), bytesOf(rankBySlot), bytesOf(order)];
  for (const body of bodies) {
    parts.push(body);
    if (body.length % 8 !== 0) parts.push(new Uint8Array(8 - (body.length % 8)));
  }
  return { header, parts };
}

/**
 * Writes the score index at `path` (temp file + rename) and returns its header.
 * @example await writeScoreIndex("runs/12/scores.index", { ids: graph.ids, scores: result.scores })
 */
export async function writeScoreIndex(path: string, input: ScoreIndexInput): Promise<ScoreIndexHeader> {
  const { header, parts } = buildScoreIndex(input);
  await writeAtomic(path, async (fh) => {
    for (const part of parts) if (part.length > 0) await fh.writeFile(part);
  });
  return header;
}
