import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { ApiError, api } from "../../../lib/api-client";

// Provisional until the shared outbox contract lands.
const IdSchema = z.union([z.string(), z.number()]).transform(String);
export const OutboxMessageSchema = z.object({
  id: IdSchema,
  to: z.string(),
  subject: z.string(),
  createdAt: z.string(),
  text: z.string(),
});
export type OutboxMessage = z.infer<typeof OutboxMessageSchema>;

export const OutboxSchema = z.object({ messages: z.array(OutboxMessageSchema) });

export function getOutbox() {
  return api.get("/outbox", OutboxSchema);
}

export const getOutboxQueryOptions = () =>
  queryOptions({ queryKey: ["outbox", "list"], queryFn: getOutbox, staleTime: 0 });

export function useOutbox() {
  return useSuspenseQuery(getOutboxQueryOptions());
}

/** The outbox only exists while the development mail fake is on; the API answers 404 otherwise. */
export function useOutboxAvailable(enabled: boolean): boolean {
  const { data } = useQuery({
    queryKey: ["outbox", "available"],
    enabled,
    staleTime: Infinity,
    queryFn: async () => {
      try {
        await getOutbox();
        return true;
      } catch (error) {
        if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
        throw error;
      }
    },
  });
  return enabled && data === true;
}
