import { queryOptions, useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { OutboxPageSchema } from "../../../../../api/contracts/outbox";
import { ApiError, api } from "../../../lib/api-client";

export type { OutboxMessage } from "../../../../../api/contracts/outbox";

export const OUTBOX_PAGE_SIZE = 100;

export function getOutbox({ limit = OUTBOX_PAGE_SIZE }: { limit?: number } = {}) {
  return api.get("/outbox", OutboxPageSchema, { query: { limit } });
}

export const getOutboxQueryOptions = () =>
  queryOptions({ queryKey: ["outbox", "list"], queryFn: () => getOutbox(), staleTime: 0 });

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
        await getOutbox({ limit: 1 });
        return true;
      } catch (error) {
        if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
        throw error;
      }
    },
  });
  return enabled && data === true;
}
