import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { OverviewSchema } from "#contracts/overview";
import { api } from "../../../lib/api-client";

export type { Overview, WorkerHealth } from "#contracts/overview";

export function getOverview() {
  return api.get("/overview", OverviewSchema);
}

export const getOverviewQueryOptions = () =>
  queryOptions({
    queryKey: ["overview"],
    queryFn: getOverview,
    // Heartbeats and residuals move constantly; a quieter refresh when nothing is running or queued.
    refetchInterval: (query) => {
      const data = query.state.data;
      const busy = data && (data.running.length > 0 || data.queue.runs.length > 0 || data.queue.ingests.length > 0);
      return busy ? 2000 : 10_000;
    },
    staleTime: 0,
  });

export function useOverview() {
  return useSuspenseQuery(getOverviewQueryOptions());
}
