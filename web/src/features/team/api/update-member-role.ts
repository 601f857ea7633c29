import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import type { Role } from "../../../lib/auth";
import { getTeamQueryOptions } from "./get-team";

export function updateMemberRole({ userId, role }: { userId: string; role: Role }) {
  return api.patch(`/team/members/${encodeURIComponent(userId)}`, { role }, null);
}

export function useUpdateMemberRole() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: updateMemberRole,
    onSettled: () => queryClient.invalidateQueries({ queryKey: getTeamQueryOptions().queryKey }),
  });
}
