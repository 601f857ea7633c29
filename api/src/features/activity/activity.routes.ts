import { ActivityPageSchema, ActivityQuerySchema } from "../../../contracts/activity";
import { defineRoute } from "../../http/route";
import { getActivityPage } from "./activity.service";

export const activityRoutes = [
  defineRoute({
    method: "get",
    path: "/api/activity",
    access: "admin",
    tag: "activity",
    summary: "The team's activity log, newest first, cursor-paginated",
    query: ActivityQuerySchema,
    response: ActivityPageSchema,
    handler: ({ deps, principal, query }) => getActivityPage(deps.db, principal.teamId, query),
  }),
];
