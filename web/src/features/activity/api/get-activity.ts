import { infiniteQueryOptions, useSuspenseInfiniteQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

// Provisional until the shared activity contract lands.
const IdSchema = z.union([z.string(), z.number()]).transform(String);
export const ActivityEntrySchema = z.object({
  id: IdSchema,
  createdAt: z.string(),
  actor: z.object({ email: z.string(), name: z.string().nullish() }).nullish(),
  action: z.string(),
  target: z.string().nullish(),
  details: z.unknown().optional(),
});
export type ActivityEntry = z.infer<typeof ActivityEntrySchema>;

export const ActivityPageSchema = z.object({
  items: z.array(ActivityEntrySchema),
  nextCursor: z.string().nullish(),
});
export type ActivityPage = z.infer<typeof ActivityPageSchema>;

export const ACTIVITY_PAGE_SIZE = 50;

export function getActivity({ cursor, limit = ACTIVITY_PAGE_SIZE }: { cursor?: string | null; limit?: number }) {
  return api.get("/activity", ActivityPageSchema, { query: { cursor, limit } });
}

export const getActivityQueryOptions = () =>
  infiniteQueryOptions({
    queryKey: ["activity", "list"],
    queryFn: ({ pageParam }) => getActivity({ cursor: pageParam }),
    initialPageParam: null as string | null,
    getNextPageParam: (page) => page.nextCursor ?? null,
  });

export function useActivity() {
  return useSuspenseInfiniteQuery(getActivityQueryOptions());
}
