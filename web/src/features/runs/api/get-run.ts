import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { RETRYABLE_RUN_STATUSES, RunDetailSchema, type RunDetail } from "#contracts/runs";
import { api } from "../../../lib/api-client";
import { isLiveRun } from "../../../lib/status";

export type { RunDetail } from "#contracts/runs";

export function getRun(id: number) {
  return api.get(`/runs/${id}`, RunDetailSchema);
}

/** A retry asked of a stopped run that no runner has taken up yet (the flag itself outlives the retry). */
export const retryPending = (run: RunDetail) => run.retryRequested && RETRYABLE_RUN_STATUSES.includes(run.status);

/** A run's figures still move while it is queued or running, or while a retry is on its way. */
export const runIsMoving = (run: RunDetail | undefined) => Boolean(run && (isLiveRun(run.status) || retryPending(run)));

export const LIVE_POLL_MS = 1000;

export const getRunQueryOptions = (id: number) =>
  queryOptions({
    queryKey: ["runs", "detail", id],
    queryFn: () => getRun(id),
    refetchInterval: (query) => (runIsMoving(query.state.data) ? LIVE_POLL_MS : false),
  });

export function useRun(id: number) {
  return useSuspenseQuery(getRunQueryOptions(id));
}
