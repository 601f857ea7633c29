// Seed files for personalized teleport: one "id[,weight]" a line (weight 1 when absent), # comments and blank lines
// allowed. Seeds name original ids; they resolve to dense ids of the graph, and unknown ids are an error listing them.

import { readFile } from "node:fs/promises";
import type { NodeIds } from "../core/graph";
import { BytesTable } from "../ingest/bytes-table";

export interface Seed {
  id: string;
  weight: number;
  line: number;
}

export class SeedError extends Error {
  override readonly name = "SeedError";
}

export async function readSeeds(path: string): Promise<Seed[]> {
  let text: string;
  try {
    text = await readFile(path, "utf8");
  } catch (e) {
    throw new SeedError(`${path}: cannot read seeds (${(e as Error).message})`);
  }
  const seeds: Seed[] = [];
  text.split(/\r?\n/).forEach((raw, i) => {
    const line = raw.replace(/^\uFEFF/, "").trim();
    if (line === "" || line.startsWith("#")) return;
    const cut = line.lastIndexOf(",");
    const id = (cut >= 0 ? line.slice(0, cut) : line).trim();
    const weightText = cut >= 0 ? line.slice(cut + 1).trim() : "1";
    const weight = Number(weightText);
    if (id === "") throw new SeedError(`${path}: line ${i + 1}: empty seed id`);
    if (weightText === "" || !Number.isFinite(weight) || weight < 0)
      throw new SeedError(`${path}: line ${i + 1}: seed weight must be a finite number ≥ 0 (found "${weightText}")`);
    seeds.push({ id, weight, line: i + 1 });
  });
  if (seeds.length === 0) throw new SeedError(`${path}: no seeds`);
  if (!(seeds.reduce((s, x) => s + x.weight, 0) > 0)) throw new SeedError(`${path}: seed weights sum to 0`);
  return seeds;
}

/** Dense ids for the seeds; throws a SeedError naming every seed id the graph does not contain. */
export function resolveSeeds(path: string, seeds: Seed[], ids: NodeIds): Array<{ node: number; weight: number }> {
  const dense = new Int32Array(seeds.length).fill(-1);
  if (ids.kind === "integer") {
    const want = new Map<bigint, number[]>();
    seeds.forEach((s, i) => {
      if (!/^\d{1,20}$/.test(s.id)) return;
      const key = BigInt(s.id);
      want.set(key, [...(want.get(key) ?? []), i]);
    });
    for (let v = 0; v < ids.ids.length && want.size > 0; v++) {
      const hit = want.get(ids.ids[v]);
      if (hit) for (const i of hit) dense[i] = v;
    }
  } else {
    const table = new BytesTable(seeds.length * 2);
    const enc = new TextEncoder();
    const slot = seeds.map((s) => {
      const b = enc.encode(s.id);
      return table.idOf(b, 0, b.length);
    });
    const nodeOf = new Int32Array(table.size).fill(-1);
    for (let v = 0; v + 1 < ids.offsets.length; v++) {
      const k = table.find(ids.bytes, ids.offsets[v], ids.offsets[v + 1]);
      if (k >= 0) nodeOf[k] = v;
    }
    slot.forEach((k, i) => (dense[i] = nodeOf[k]));
  }
  const unknown = seeds.filter((_, i) => dense[i] < 0);
  if (unknown.length > 0) {
    const shown = unknown.slice(0, 20).map((s) => `${JSON.stringify(s.id)} (line ${s.line})`);
    const more = unknown.length > 20 ? ` and ${unknown.length - 20} more` : "";
    throw new SeedError(`${path}: ${unknown.length} seed id${unknown.length > 1 ? "s are" : " is"} not in the graph: ${shown.join(", ")}${more}`);
  }
  return seeds.map((s, i) => ({ node: dense[i], weight: s.weight }));
}
