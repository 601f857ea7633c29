import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { GraphPageSchema, type GraphQuery } from "#contracts/graphs";
import { api } from "../../../lib/api-client";

export type { GraphSummary } from "#contracts/graphs";
export type GraphFilter = Pick<GraphQuery, "sort" | "order"> & Partial<Pick<GraphQuery, "status" | "q">>;

export const GRAPHS_PAGE_SIZE = 25;

export function getGraphs(filter: GraphFilter & { cursor?: string | null; limit?: number }) {
  const { cursor, limit = GRAPHS_PAGE_SIZE, ...rest } = filter;
  return api.get("/graphs", GraphPageSchema, { query: { ...rest, cursor, limit } });
}

export const getGraphsQueryOptions = (filter: GraphFilter, cursor: string | null) =>
  queryOptions({
    queryKey: ["graphs", "list", filter, cursor],
    queryFn: () => getGraphs({ ...filter, cursor }),
    // While any listed graph is still on its way in, the page refreshes itself.
    refetchInterval: (query) =>
      query.state.data?.items.some((g) => g.status === "queued" || g.status === "ingesting") ? 2000 : false,
  });

export function useGraphs(filter: GraphFilter, cursor: string | null) {
  return useQuery({ ...getGraphsQueryOptions(filter, cursor), placeholderData: keepPreviousData });
}

/** Ready graphs for pickers (the run form), newest first. */
export const getReadyGraphsQueryOptions = () =>
  queryOptions({
    queryKey: ["graphs", "list", "ready"],
    queryFn: () => getGraphs({ sort: "created", order: "desc", status: "ready", limit: 200 }),
  });

export function useReadyGraphs() {
  return useQuery(getReadyGraphsQueryOptions());
}
