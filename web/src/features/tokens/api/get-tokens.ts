import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { TokenListSchema } from "../../../../../api/contracts/tokens";
import { api } from "../../../lib/api-client";

export type { TokenSummary } from "../../../../../api/contracts/tokens";

export function getTokens() {
  return api.get("/tokens", TokenListSchema);
}

export const getTokensQueryOptions = () => queryOptions({ queryKey: ["tokens", "list"], queryFn: getTokens });

export function useTokens() {
  return useSuspenseQuery(getTokensQueryOptions());
}
