import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { getInvitesQueryOptions } from "./get-invites";

export function revokeInvite({ id }: { id: number }) {
  return api.delete(`/team/invites/${id}`, null);
}

export function useRevokeInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvite,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitesQueryOptions().queryKey }),
  });
}
