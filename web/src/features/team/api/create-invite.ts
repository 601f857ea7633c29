import { useMutation, useQueryClient } from "@tanstack/react-query";
import { CreateInviteSchema, InviteSchema, type CreateInvite } from "../../../../../api/contracts/team";
import { api } from "../../../lib/api-client";
import { getInvitesQueryOptions } from "./get-invites";

export { CreateInviteSchema };

export function createInvite(input: CreateInvite) {
  return api.post("/team/invites", input, InviteSchema);
}

export function useCreateInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvite,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitesQueryOptions().queryKey }),
  });
}
