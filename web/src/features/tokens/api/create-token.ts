import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { getTokensQueryOptions } from "./get-tokens";

export const CreateTokenInputSchema = z.object({
  name: z.string().trim().min(1, "Give the token a name.").max(80, "Use at most 80 characters."),
});
export type CreateTokenInput = z.infer<typeof CreateTokenInputSchema>;

export const CreatedTokenSchema = z.object({
  id: z.union([z.string(), z.number()]).transform(String),
  name: z.string(),
  token: z.string(),
});
export type CreatedToken = z.infer<typeof CreatedTokenSchema>;

export function createToken(input: CreateTokenInput) {
  return api.post("/tokens", input, CreatedTokenSchema);
}

export function useCreateToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getTokensQueryOptions().queryKey }),
  });
}
