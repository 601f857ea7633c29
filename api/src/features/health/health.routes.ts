import { HealthSchema } from "../../../contracts/health";
import { defineRoute } from "../../http/route";
import { checkHealth } from "./health.service";

export const healthRoutes = [
  defineRoute({
    method: "get",
    path: "/api/health",
    access: "public",
    tag: "meta",
    summary: "200 when the server and the database answer, 503 otherwise",
    response: HealthSchema,
    handler: ({ deps }) => checkHealth(deps),
  }),
];
