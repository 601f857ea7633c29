import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { getTeamQueryOptions } from "./get-team";

export function removeMember({ userId }: { userId: number }) {
  return api.delete(`/team/members/${userId}`, null);
}

export function useRemoveMember() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: removeMember,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getTeamQueryOptions().queryKey }),
  });
}
