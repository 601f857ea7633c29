import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { iterationsQueryKey } from "./get-iterations";

export function cancelRun({ id }: { id: number }) {
  return api.post(`/runs/${id}/cancel`, {}, null);
}

export function retryRun({ id }: { id: number }) {
  return api.post(`/runs/${id}/retry`, {}, null);
}

export function useCancelRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: cancelRun,
    onSuccess: (_data, { id }) => queryClient.invalidateQueries({ queryKey: ["runs", "detail", id] }),
  });
}

export function useRetryRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: retryRun,
    onSuccess: (_data, { id }) => {
      // The resumed run rewrites history from its checkpoint on; start the merged copy afresh.
      queryClient.removeQueries({ queryKey: iterationsQueryKey(id) });
      return queryClient.invalidateQueries({ queryKey: ["runs"] });
    },
  });
}

export function deleteRun({ id }: { id: number }) {
  return api.delete(`/runs/${id}`, null);
}

export function useDeleteRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteRun,
    // The deleted run's own queries are left alone: the page still shows them until it navigates away.
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["runs", "list"] }),
  });
}
