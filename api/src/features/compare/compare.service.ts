import type { Comparison, CompareQuery } from "../../../contracts/compare";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { parametersOf, requireRun } from "../runs/runs.service";
import { withScoreIndex } from "../runs/score-index";
import { compareIndexes } from "./compare-index";

export { compareColumns, RBO_P, type ComparisonCore, type ScoreColumns } from "./compare-columns";

export async function compareRuns(deps: AppDeps, principal: Principal, query: CompareQuery): Promise<Comparison> {
  const [ra, rb] = await Promise.all([requireRun(deps.db, principal, query.a), requireRun(deps.db, principal, query.b)]);
  const k = query.k ?? Math.min(parametersOf(ra.run).topK, parametersOf(rb.run).topK);
  const ref = (row: typeof ra, nodes: number) => ({
    id: row.run.id,
    graph: { id: row.run.graphId, name: row.graphName },
    status: row.run.status,
    nodes,
  });
  return withScoreIndex(deps.config.dataDir, ra.run, (ia) =>
    withScoreIndex(deps.config.dataDir, rb.run, async (ib) => {
      const core = await compareIndexes(ia, ib, k, query.limit);
      return { a: ref(ra, ia.n), b: ref(rb, ib.n), ...core };
    }),
  );
}
