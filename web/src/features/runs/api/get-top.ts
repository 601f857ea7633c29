import { queryOptions, useQuery } from "@tanstack/react-query";
import { MAX_TOP_K, TopPageSchema, type TopPage } from "#contracts/runs";
import { api } from "../../../lib/api-client";

export type { TopEntry, TopPage } from "#contracts/runs";

const FETCH_LIMIT = 1000;

/** The whole stored top-k (at most MAX_TOP_K positions), fetched page by page along the API's cursor. */
export async function getTopAll(id: number): Promise<TopPage> {
  let cursor: string | null = null;
  let last: TopPage | null = null;
  const items: TopPage["items"] = [];
  do {
    const page: TopPage = await api.get(`/runs/${id}/top`, TopPageSchema, { query: { limit: FETCH_LIMIT, cursor } });
    items.push(...page.items);
    cursor = page.nextCursor;
    last = page;
  } while (cursor && items.length < MAX_TOP_K);
  return { ...(last as TopPage), items, nextCursor: null };
}

export const getTopQueryOptions = (id: number) =>
  queryOptions({ queryKey: ["runs", "top", id], queryFn: () => getTopAll(id), staleTime: Infinity });

export function useTop(id: number, enabled: boolean) {
  return useQuery({ ...getTopQueryOptions(id), enabled });
}
