// A score index for a run that has only its Arrow score file: one read of the file, no string per id.
import { readFile } from "node:fs/promises";
import { DataType, tableFromIPC, type Data, type Vector } from "apache-arrow";
import type { NodeIds } from "../core/graph";
import type { ScoreIndexHeader } from "./format";
import { writeScoreIndex, type ScoreIndexInput } from "./write";

function integerIds(column: Vector): NodeIds {
  const out = new BigUint64Array(column.length);
  let at = 0;
  for (const data of column.data as Data[]) {
    const values = data.values as BigUint64Array;
    out.set(values.subarray(data.offset, data.offset + data.length), at);
    at += data.length;
  }
  return { kind: "integer", ids: out };
}

function stringIds(column: Vector): NodeIds {
  const chunks = column.data as Data[];
  let total = 0;
  for (const data of chunks) {
    const offs = data.valueOffsets as Int32Array;
    total += offs[data.offset + data.length] - offs[data.offset];
  }
  if (total > 0xffffffff) throw new RangeError(`string ids must fit 4 GiB in all. Value: ${total} bytes`);
  const offsets = new Uint32Array(column.length + 1);
  const bytes = new Uint8Array(total);
  let row = 0;
  let at = 0;
  for (const data of chunks) {
    const offs = data.valueOffsets as Int32Array;
    const values = data.values as Uint8Array;
    const first = offs[data.offset];
    bytes.set(values.subarray(first, offs[data.offset + data.length]), at);
    for (let i = 1; i <= data.length; i++) offsets[row + i] = at + (offs[data.offset + i] - first);
    row += data.length;
    at = offsets[row];
  }
  return { kind: "string", bytes, offsets };
}

/** ids, scores and ranks of an Arrow score file (`node_id` uint64 or utf8, `score` float64, `rank` uint32). */
export async function readArrowScores(file: string): Promise<Required<ScoreIndexInput>> {
  const table = tableFromIPC(await readFile(file));
  const id = table.getChild("node_id");
  const score = table.getChild("score");
  const rank = table.getChild("rank");
  if (!id || !score || !rank) throw new Error(`${file}: not a score file (node_id, score and rank columns expected)`);
  if (id.nullCount > 0) throw new Error(`${file}: node_id has null entries`);
  let ids: NodeIds;
  if (DataType.isUtf8(id.type)) ids = stringIds(id);
  else if (DataType.isInt(id.type) && id.type.bitWidth === 64 && !id.type.isSigned) ids = integerIds(id);
  else throw new Error(`${file}: node_id must be uint64 or utf8, not ${String(id.type)}`);
  return { ids, scores: Float64Array.from(score.toArray() as Float64Array), ranks: Uint32Array.from(rank.toArray() as Uint32Array) };
}

/**
 * Builds the score index at `indexPath` from the Arrow score file at `arrowPath` (temp file + rename).
 * @example await scoreIndexFromArrow("runs/12/scores.arrow", "runs/12/scores.index")
 */
export async function scoreIndexFromArrow(arrowPath: string, indexPath: string): Promise<ScoreIndexHeader> {
  return writeScoreIndex(indexPath, await readArrowScores(arrowPath));
}
