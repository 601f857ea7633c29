import { useMutation, useQueryClient } from "@tanstack/react-query";
import type { UpdateMember } from "../../../../../api/contracts/team";
import { api } from "../../../lib/api-client";
import { getTeamQueryOptions } from "./get-team";

export function updateMemberRole({ userId, role }: UpdateMember & { userId: number }) {
  return api.patch(`/team/members/${userId}`, { role }, null);
}

export function useUpdateMemberRole() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMemberRole,
    onSettled: () => queryClient.invalidateQueries({ queryKey: getTeamQueryOptions().queryKey }),
  });
}
