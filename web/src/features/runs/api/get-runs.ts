import { keepPreviousData, queryOptions, useQuery } from "@tanstack/react-query";
import { RunPageSchema, type RunQuery } from "#contracts/runs";
import { api } from "../../../lib/api-client";
import { isLiveRun } from "../../../lib/status";

export type { RunSummary, RunStatus } from "#contracts/runs";
export type RunFilter = Partial<Pick<RunQuery, "status" | "graphId">>;

export const RUNS_PAGE_SIZE = 25;

export function getRuns(filter: RunFilter & { cursor?: string | null; limit?: number }) {
  const { cursor, limit = RUNS_PAGE_SIZE, ...rest } = filter;
  return api.get("/runs", RunPageSchema, { query: { ...rest, cursor, limit } });
}

export const getRunsQueryOptions = (filter: RunFilter, cursor: string | null = null, limit = RUNS_PAGE_SIZE) =>
  queryOptions({
    queryKey: ["runs", "list", filter, cursor, limit],
    queryFn: () => getRuns({ ...filter, cursor, limit }),
    refetchInterval: (query) => (query.state.data?.items.some((run) => isLiveRun(run.status)) ? 2000 : false),
  });

export function useRuns(filter: RunFilter, cursor: string | null = null, limit = RUNS_PAGE_SIZE) {
  return useQuery({ ...getRunsQueryOptions(filter, cursor, limit), placeholderData: keepPreviousData });
}
