import type { RunParameters } from "#contracts/runs";
import { formatSciCompact } from "../../../lib/format";

/** One line of the parameters that matter when scanning a list: "α 0.85 · tol 1e-9 · 3 seeds · top 100". */
export function parametersSummary(p: RunParameters): string {
  return [
    `α ${p.damping}`,
    `tol ${formatSciCompact(p.tolerance)}`,
    p.teleport.kind === "seeds" ? `${p.teleport.seeds.length} ${p.teleport.seeds.length === 1 ? "seed" : "seeds"}` : "uniform",
    p.weighted ? "weighted" : null,
    p.dangling === "uniform" ? "dangling uniform" : null,
    `top ${p.topK}`,
  ]
    .filter(Boolean)
    .join(" · ");
}
