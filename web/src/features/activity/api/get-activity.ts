import { infiniteQueryOptions, useSuspenseInfiniteQuery } from "@tanstack/react-query";
import { ActivityPageSchema } from "../../../../../api/contracts/activity";
import { api } from "../../../lib/api-client";

export type { ActivityItem } from "../../../../../api/contracts/activity";

export const ACTIVITY_PAGE_SIZE = 50;

export function getActivity({ cursor, limit = ACTIVITY_PAGE_SIZE }: { cursor?: string | null; limit?: number }) {
  return api.get("/activity", ActivityPageSchema, { query: { cursor, limit } });
}

export const getActivityQueryOptions = () =>
  infiniteQueryOptions({
    queryKey: ["activity", "list"],
    queryFn: ({ pageParam }) => getActivity({ cursor: pageParam }),
    initialPageParam: null as string | null,
    getNextPageParam: (page) => page.nextCursor,
  });

export function useActivity() {
  return useSuspenseInfiniteQuery(getActivityQueryOptions());
}
