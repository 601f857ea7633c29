import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

// Provisional until the shared tokens contract lands.
const IdSchema = z.union([z.string(), z.number()]).transform(String);
export const TokenSummarySchema = z.object({
  id: IdSchema,
  name: z.string(),
  createdAt: z.string().nullish(),
  lastUsedAt: z.string().nullish(),
});
export type TokenSummary = z.infer<typeof TokenSummarySchema>;

export const TokenListSchema = z.object({ tokens: z.array(TokenSummarySchema) });

export function getTokens() {
  return api.get("/tokens", TokenListSchema);
}

export const getTokensQueryOptions = () => queryOptions({ queryKey: ["tokens", "list"], queryFn: getTokens });

export function useTokens() {
  return useSuspenseQuery(getTokensQueryOptions());
}
