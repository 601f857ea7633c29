import { useQuery, useQueryClient, type QueryClient } from "@tanstack/react-query";
import { RunEventListSchema, type RunEventList } from "#contracts/runs";
import { api } from "../../../lib/api-client";
import { LIVE_POLL_MS } from "./get-run";

export type { RunEvent } from "#contracts/runs";

const eventsQueryKey = (id: number) => ["runs", "events", id] as const;

/** Events only grow: each poll asks for those after the newest one held. */
async function getEventsSince(queryClient: QueryClient, id: number): Promise<RunEventList> {
  const previous = queryClient.getQueryData<RunEventList>(eventsQueryKey(id));
  const after = previous?.items.at(-1)?.id ?? 0;
  const page = await api.get(`/runs/${id}/events`, RunEventListSchema, { query: { after, limit: 500 } });
  return previous ? { items: [...previous.items, ...page.items.filter((e) => e.id > after)] } : page;
}

export function useRunEvents(id: number, live: boolean) {
  const queryClient = useQueryClient();
  return useQuery({
    queryKey: eventsQueryKey(id),
    queryFn: () => getEventsSince(queryClient, id),
    refetchInterval: live ? LIVE_POLL_MS : false,
    staleTime: live ? 0 : 30_000,
  });
}
