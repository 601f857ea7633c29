import { useMutation, useQueryClient } from "@tanstack/react-query";
import { RetryGraphSchema, type RetryGraph } from "#contracts/graphs";
import { api } from "../../../lib/api-client";

export { RetryGraphSchema };

export function retryGraph({ id, ...body }: RetryGraph & { id: number }) {
  return api.post(`/graphs/${id}/retry`, body, null);
}

export function useRetryGraph() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: retryGraph,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["graphs"] }),
  });
}
