// Score columns in rank order as an Arrow table with file-level metadata.
// apache-arrow is passed in, not imported: it loads only when an Arrow or Parquet file is asked for (a bundler would
// hoist a static import of it to start-up).
import type { Data, DataType, Table } from "apache-arrow";
import type { NodeIds } from "../core/graph";

type Arrow = typeof import("apache-arrow");

/** Column `node_id`: the original ids permuted into `order`; uint64 for integer ids, utf8 for string ids. */
function idColumn(arrow: Arrow, ids: NodeIds, order: Uint32Array): Data<DataType> {
  const { makeData, Uint64, Utf8 } = arrow;
  const n = order.length;
  if (ids.kind === "integer") {
    const out = new BigUint64Array(n);
    for (let i = 0; i < n; i++) out[i] = ids.ids[order[i]];
    return makeData({ type: new Uint64(), length: n, data: out });
  }
  const offs = ids.offsets;
  let total = 0;
  for (let i = 0; i < n; i++) total += offs[order[i] + 1] - offs[order[i]];
  if (total > 0x7fffffff) throw new RangeError(`string ids must fit 2 GiB in all. Value: ${total} bytes`);
  const valueOffsets = new Int32Array(n + 1);
  const bytes = new Uint8Array(total);
  let at = 0;
  for (let i = 0; i < n; i++) {
    const v = order[i];
    bytes.set(ids.bytes.subarray(offs[v], offs[v + 1]), at);
    at += offs[v + 1] - offs[v];
    valueOffsets[i + 1] = at;
  }
  return makeData({ type: new Utf8(), length: n, valueOffsets, data: bytes });
}

/**
 * Table { node_id: uint64 | utf8, score: float64, rank: uint32 } with rows in rank order (rank = row + 1).
 * @example scoreTable(await import("apache-arrow"), ids, scores, rankOrder(scores), { iterations: "12" })
 */
export function scoreTable(arrow: Arrow, ids: NodeIds, scores: Float64Array, order: Uint32Array, meta: Record<string, string>): Table {
  const { Field, Float64, makeData, RecordBatch, Schema, Struct, Table, Uint32 } = arrow;
  const n = order.length;
  const score = new Float64Array(n);
  const rank = new Uint32Array(n);
  for (let i = 0; i < n; i++) {
    score[i] = scores[order[i]];
    rank[i] = i + 1;
  }
  const id = idColumn(arrow, ids, order);
  const fields = [
    new Field("node_id", id.type, false),
    new Field("score", new Float64(), false),
    new Field("rank", new Uint32(), false),
  ];
  const schema = new Schema(fields, new Map(Object.entries(meta)));
  const children = [id, makeData({ type: new Float64(), length: n, data: score }), makeData({ type: new Uint32(), length: n, data: rank })];
  const data = makeData({ type: new Struct(fields), length: n, nullCount: 0, children });
  return new Table(schema, new RecordBatch(schema, data));
}
