import { useMutation, useQueryClient } from "@tanstack/react-query";
import { CreatedSchema } from "#contracts/graphs";
import { CreateRunSchema, type CreateRun } from "#contracts/runs";
import { api } from "../../../lib/api-client";

export { CreateRunSchema };

export function createRun(input: CreateRun) {
  return api.post("/runs", input, CreatedSchema);
}

export function useCreateRun() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createRun,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: ["runs", "list"] }),
  });
}
