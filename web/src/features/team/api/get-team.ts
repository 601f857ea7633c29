import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { RoleSchema } from "../../../lib/auth";

// Provisional until the shared team contract lands.
const IdSchema = z.union([z.string(), z.number()]).transform(String);
export const MemberSchema = z.object({
  userId: IdSchema,
  name: z.string().nullish(),
  email: z.string(),
  role: RoleSchema,
  joinedAt: z.string().nullish(),
});
export type Member = z.infer<typeof MemberSchema>;

export const TeamSchema = z.object({
  team: z.object({ id: IdSchema, name: z.string() }),
  members: z.array(MemberSchema),
});
export type Team = z.infer<typeof TeamSchema>;

export function getTeam() {
  return api.get("/team", TeamSchema);
}

export const getTeamQueryOptions = () => queryOptions({ queryKey: ["team", "detail"], queryFn: getTeam });

export function useTeam() {
  return useSuspenseQuery(getTeamQueryOptions());
}
