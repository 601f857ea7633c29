import { useQuery } from "@tanstack/react-query";
import { ComparisonSchema } from "#contracts/compare";
import { api } from "../../../lib/api-client";

export type { Comparison, Mover } from "#contracts/compare";

export function getComparison(a: number, b: number, limit = 20) {
  return api.get("/compare", ComparisonSchema, { query: { a, b, limit } });
}

export function useComparison(a: number | null, b: number | null) {
  return useQuery({
    queryKey: ["compare", a, b],
    queryFn: () => getComparison(a ?? 0, b ?? 0),
    enabled: a !== null && b !== null && a !== b,
    staleTime: Infinity,
  });
}
