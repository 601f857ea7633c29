import { useMutation, useQueryClient } from "@tanstack/react-query";
import { CreatedSchema, CreateGraphSchema, type CreateGraph } from "#contracts/graphs";
import { api } from "../../../lib/api-client";

export { CreateGraphSchema };

export function createGraph(input: CreateGraph) {
  return api.post("/graphs", input, CreatedSchema);
}

export function useCreateGraph() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createGraph,
    onSuccess: () => Promise.all([queryClient.invalidateQueries({ queryKey: ["graphs"] }), queryClient.invalidateQueries({ queryKey: ["uploads"] })]),
  });
}
