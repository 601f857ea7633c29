import { useQuery } from "@tanstack/react-query";
import { HistogramSchema } from "#contracts/runs";
import { api } from "../../../lib/api-client";

export type { Histogram } from "#contracts/runs";

export function getHistogram(id: number) {
  return api.get(`/runs/${id}/histogram`, HistogramSchema);
}

export function useHistogram(id: number, enabled: boolean) {
  return useQuery({ queryKey: ["runs", "histogram", id], queryFn: () => getHistogram(id), enabled, staleTime: Infinity });
}
