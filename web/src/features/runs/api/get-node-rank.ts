import { useQuery } from "@tanstack/react-query";
import { NodeLookupSchema } from "#contracts/runs";
import { api } from "../../../lib/api-client";

export type { NodeLookup } from "#contracts/runs";

export function getNodeRank(runId: number, nodeId: string) {
  return api.get(`/runs/${runId}/nodes/${encodeURIComponent(nodeId)}`, NodeLookupSchema);
}

export function useNodeRank(runId: number, nodeId: string | null) {
  return useQuery({
    queryKey: ["runs", "node", runId, nodeId],
    queryFn: () => getNodeRank(runId, nodeId ?? ""),
    enabled: nodeId !== null && nodeId !== "",
    staleTime: Infinity,
  });
}
