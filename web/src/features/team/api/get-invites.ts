import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { InviteListSchema } from "../../../../../api/contracts/team";
import { api } from "../../../lib/api-client";

export type { Invite } from "../../../../../api/contracts/team";

export function getInvites() {
  return api.get("/team/invites", InviteListSchema);
}

export const getInvitesQueryOptions = () =>
  queryOptions({ queryKey: ["team", "invites"], queryFn: getInvites });

export function useInvites() {
  return useSuspenseQuery(getInvitesQueryOptions());
}
