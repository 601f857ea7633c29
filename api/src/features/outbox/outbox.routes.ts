import { OutboxPageSchema, OutboxQuerySchema } from "../../../contracts/outbox";
import { defineRoute } from "../../http/route";
import { getOutboxPage } from "./outbox.service";

export const outboxRoutes = [
  defineRoute({
    method: "get",
    path: "/api/outbox",
    access: "admin",
    tag: "outbox",
    summary: "The team's mail captured by the development mail fake, newest first (404 when the fake is off)",
    query: OutboxQuerySchema,
    response: OutboxPageSchema,
    handler: ({ deps, principal, query }) => getOutboxPage(deps, principal, query),
  }),
];
