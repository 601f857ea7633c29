import { OverviewSchema } from "../../../contracts/overview";
import { defineRoute } from "../../http/route";
import { getOverview } from "./overview.service";

export const overviewRoutes = [
  defineRoute({
    method: "get",
    path: "/api/overview",
    access: "viewer",
    tag: "overview",
    summary: "Queue (queued runs and ingests), running runs with progress, worker pool health, recent work",
    response: OverviewSchema,
    handler: ({ deps, principal }) => getOverview(deps, principal),
  }),
];
