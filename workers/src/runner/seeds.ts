// Seed lists name original node ids; the engine wants dense ids. One pass over the id dictionary resolves them all.
import type { NodeIds } from "../core/graph";
import { BytesTable } from "../ingest/bytes-table";

export interface SeedInput {
  node: string;
  weight: number;
}

export class UnknownSeedsError extends Error {
  override readonly name = "UnknownSeedsError";
  constructor(readonly unknown: string[]) {
    const shown = unknown.slice(0, 20).map((id) => JSON.stringify(id));
    const more = unknown.length > 20 ? ` and ${unknown.length - 20} more` : "";
    super(`${unknown.length} seed id${unknown.length === 1 ? " is" : "s are"} not in the graph: ${shown.join(", ")}${more}`);
  }
}

/** Dense ids for the seeds in input order; throws UnknownSeedsError naming every id the graph lacks. */
export function resolveSeedIds(seeds: readonly SeedInput[], ids: NodeIds): Array<{ node: number; weight: number }> {
  const dense = new Int32Array(seeds.length).fill(-1);
  if (ids.kind === "integer") {
    const want = new Map<bigint, number[]>();
    seeds.forEach((s, i) => {
      const text = s.node.trim();
      if (!/^\d{1,20}$/.test(text)) return;
      const key = BigInt(text);
      if (key >= 2n ** 64n) return;
      want.set(key, [...(want.get(key) ?? []), i]);
    });
    for (let v = 0; v < ids.ids.length && want.size > 0; v++) {
      const hit = want.get(ids.ids[v]);
      if (!hit) continue;
      for (const i of hit) dense[i] = v;
      want.delete(ids.ids[v]);
    }
  } else {
    const table = new BytesTable(seeds.length * 2);
    const encoder = new TextEncoder();
    const slot = seeds.map((s) => {
      const b = encoder.encode(s.node);
      return table.idOf(b, 0, b.length);
    });
    const nodeOf = new Int32Array(table.size).fill(-1);
    let left = table.size;
    for (let v = 0; v + 1 < ids.offsets.length && left > 0; v++) {
      const k = table.find(ids.bytes, ids.offsets[v], ids.offsets[v + 1]);
      if (k >= 0 && nodeOf[k] < 0) {
        nodeOf[k] = v;
        left--;
      }
    }
    slot.forEach((k, i) => (dense[i] = nodeOf[k]));
  }
  const unknown = [...new Set(seeds.filter((_, i) => dense[i] < 0).map((s) => s.node))];
  if (unknown.length > 0) throw new UnknownSeedsError(unknown);
  return seeds.map((s, i) => ({ node: dense[i], weight: s.weight }));
}

const utf8 = new TextDecoder("utf-8");

/** The original id of dense node v, as text. */
export function idText(ids: NodeIds, v: number): string {
  if (ids.kind === "integer") return ids.ids[v].toString();
  return utf8.decode(ids.bytes.subarray(ids.offsets[v], ids.offsets[v + 1]));
}
