import { CompareQuerySchema, ComparisonSchema } from "../../../contracts/compare";
import { defineRoute } from "../../http/route";
import { compareRuns } from "./compare.service";

export const compareRoutes = [
  defineRoute({
    method: "get",
    path: "/api/compare",
    access: "viewer",
    tag: "results",
    summary:
      "Compare run b with run a: Kendall tau-b and Spearman rho over common nodes, top-k overlap, rank-biased overlap (p = 0.9), biggest movers, nodes only in one run",
    query: CompareQuerySchema,
    response: ComparisonSchema,
    handler: ({ deps, principal, query }) => compareRuns(deps, principal, query),
  }),
];
