import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { GraphDetailSchema } from "#contracts/graphs";
import { api } from "../../../lib/api-client";

export type { GraphDetail, GraphOptions, GraphProblem, GraphStatistics, DegreeBin, Rejection } from "#contracts/graphs";

export function getGraph(id: number) {
  return api.get(`/graphs/${id}`, GraphDetailSchema);
}

export const getGraphQueryOptions = (id: number) =>
  queryOptions({
    queryKey: ["graphs", "detail", id],
    queryFn: () => getGraph(id),
    // Ingest progress is written a few times a second; poll while the graph is on its way.
    refetchInterval: (query) => {
      const status = query.state.data?.status;
      return status === "queued" || status === "ingesting" ? 1000 : false;
    },
  });

export function useGraph(id: number) {
  return useSuspenseQuery(getGraphQueryOptions(id));
}
