import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { TeamSchema } from "../../../../../api/contracts/team";
import { api } from "../../../lib/api-client";

export type { Member, Team } from "../../../../../api/contracts/team";

export function getTeam() {
  return api.get("/team", TeamSchema);
}

export const getTeamQueryOptions = () => queryOptions({ queryKey: ["team", "detail"], queryFn: getTeam });

export function useTeam() {
  return useSuspenseQuery(getTeamQueryOptions());
}
