import { QueryClient, type DefaultOptions } from "@tanstack/react-query";
import { ApiError } from "./api-client";

const queryConfig = {
  queries: {
    staleTime: 30_000,
    refetchOnWindowFocus: false,
    retry: (failureCount, error) => {
      // Client errors will not change on retry; only flaky network or 5xx are worth another go.
      if (error instanceof ApiError && error.status >= 400 && error.status < 500) return false;
      return failureCount < 2;
    },
  },
  mutations: { retry: false },
} satisfies DefaultOptions;

export const queryClient = new QueryClient({ defaultOptions: queryConfig });
