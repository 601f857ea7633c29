import { useQuery, useQueryClient, type QueryClient } from "@tanstack/react-query";
import { IterationListSchema, type IterationList } from "#contracts/runs";
import { api } from "../../../lib/api-client";
import { LIVE_POLL_MS } from "./get-run";

export type { Iteration, IterationList } from "#contracts/runs";

export const iterationsQueryKey = (id: number) => ["runs", "iterations", id] as const;

/**
 * Fetches only the iterations after the last one held and merges them by k, so polling a long run stays cheap; a
 * resumed run that records an iteration again replaces the old entry.
 */
async function getIterationsSince(queryClient: QueryClient, id: number): Promise<IterationList> {
  const previous = queryClient.getQueryData<IterationList>(iterationsQueryKey(id));
  const after = previous?.items.at(-1)?.k ?? -1;
  const page = await api.get(`/runs/${id}/iterations`, IterationListSchema, { query: { after } });
  if (!previous) return page;
  const byK = new Map(previous.items.map((item) => [item.k, item]));
  for (const item of page.items) byK.set(item.k, item);
  return { ...page, items: [...byK.values()].sort((a, b) => a.k - b.k) };
}

export function useIterations(id: number, live: boolean) {
  const queryClient = useQueryClient();
  return useQuery({
    queryKey: iterationsQueryKey(id),
    queryFn: () => getIterationsSince(queryClient, id),
    refetchInterval: live ? LIVE_POLL_MS : false,
    staleTime: live ? 0 : Infinity,
  });
}
