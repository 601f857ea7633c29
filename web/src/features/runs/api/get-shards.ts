import { useQuery } from "@tanstack/react-query";
import { ShardListSchema } from "#contracts/runs";
import { api } from "../../../lib/api-client";
import { LIVE_POLL_MS } from "./get-run";

export type { Shard } from "#contracts/runs";

export function getShards(id: number) {
  return api.get(`/runs/${id}/shards`, ShardListSchema);
}

export function useShards(id: number, live: boolean) {
  return useQuery({
    queryKey: ["runs", "shards", id],
    queryFn: () => getShards(id),
    refetchInterval: live ? LIVE_POLL_MS : false,
  });
}
