import { useMutation, useQueryClient } from "@tanstack/react-query";
import { CreatedTokenSchema, CreateTokenSchema, type CreateToken } from "../../../../../api/contracts/tokens";
import { api } from "../../../lib/api-client";
import { getTokensQueryOptions } from "./get-tokens";

export { CreateTokenSchema };
export type { CreatedToken } from "../../../../../api/contracts/tokens";

export function createToken(input: CreateToken) {
  return api.post("/tokens", input, CreatedTokenSchema);
}

export function useCreateToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getTokensQueryOptions().queryKey }),
  });
}
