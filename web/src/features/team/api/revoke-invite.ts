import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { getInvitesQueryOptions } from "./get-invites";

export function revokeInvite({ id }: { id: string }) {
  return api.delete(`/team/invites/${encodeURIComponent(id)}`, null);
}

export function useRevokeInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: revokeInvite,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitesQueryOptions().queryKey }),
  });
}
