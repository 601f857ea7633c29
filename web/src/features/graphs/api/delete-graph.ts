import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";

export function deleteGraph({ id }: { id: number }) {
  return api.delete(`/graphs/${id}`, null);
}

export function useDeleteGraph() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: deleteGraph,
    onSuccess: (_data, { id }) => {
      queryClient.removeQueries({ queryKey: ["graphs", "detail", id] });
      return queryClient.invalidateQueries({ queryKey: ["graphs", "list"] });
    },
  });
}
