import type { Seed } from "#contracts/runs";

export type SeedParse = { seeds: Seed[]; errors: string[] };

const NUMBER = /^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/;

/**
 * Reads a seed list, one `id[,weight]` per line (a tab or spaces may stand in for the comma). Blank lines and lines
 * starting with `#` are skipped. The weight is split at the last separator so ids may themselves contain commas;
 * a last field that is not a number belongs to the id. Missing weights are 1.
 */
export function parseSeeds(text: string): SeedParse {
  const seeds: Seed[] = [];
  const errors: string[] = [];
  const lines = text.split(/\r?\n/);
  lines.forEach((raw, index) => {
    const line = raw.trim();
    if (line === "" || line.startsWith("#")) return;
    const match = /^(.*?)[\s,]+([^\s,]+)$/.exec(line);
    let node = line;
    let weight = 1;
    if (match && match[1] !== undefined && match[2] !== undefined && NUMBER.test(match[2])) {
      node = match[1].trim();
      weight = Number(match[2]);
      if (!(weight > 0) || !Number.isFinite(weight)) {
        errors.push(`Line ${index + 1}: the weight must be a positive number.`);
        return;
      }
    }
    if (node === "") {
      errors.push(`Line ${index + 1}: there is a weight but no node id.`);
      return;
    }
    seeds.push({ node, weight });
  });
  return { seeds, errors };
}

/** A 400 from the API names the seed ids the graph does not contain. */
export function unknownSeedIds(details: unknown): string[] {
  if (typeof details !== "object" || details === null || !("unknown" in details)) return [];
  const unknown = (details as { unknown: unknown }).unknown;
  return Array.isArray(unknown) ? unknown.map(String) : [];
}
