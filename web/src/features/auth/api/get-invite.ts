import { queryOptions, useQuery } from "@tanstack/react-query";
import { InvitePreviewSchema } from "../../../../../api/contracts/team";
import { api } from "../../../lib/api-client";

export function getInvite(token: string) {
  return api.get(`/invites/${encodeURIComponent(token)}`, InvitePreviewSchema, { on401: "throw" });
}

export const getInviteQueryOptions = (token: string) =>
  queryOptions({ queryKey: ["invites", "public", token], queryFn: () => getInvite(token), retry: false });

export function useInvite(token: string) {
  return useQuery(getInviteQueryOptions(token));
}
