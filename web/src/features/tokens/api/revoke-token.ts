import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { getTokensQueryOptions } from "./get-tokens";

export function revokeToken({ id }: { id: number }) {
  return api.delete(`/tokens/${id}`, null);
}

export function useRevokeToken() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeToken,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getTokensQueryOptions().queryKey }),
  });
}
