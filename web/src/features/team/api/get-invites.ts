import { queryOptions, useSuspenseQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { RoleSchema } from "../../../lib/auth";

// Provisional until the shared team contract lands.
const IdSchema = z.union([z.string(), z.number()]).transform(String);
export const InviteSchema = z.object({
  id: IdSchema,
  email: z.string(),
  role: RoleSchema,
  createdAt: z.string().nullish(),
  expiresAt: z.string().nullish(),
});
export type Invite = z.infer<typeof InviteSchema>;

export const InviteListSchema = z.object({ invites: z.array(InviteSchema) });

export function getInvites() {
  return api.get("/team/invites", InviteListSchema);
}

export const getInvitesQueryOptions = () =>
  queryOptions({ queryKey: ["team", "invites"], queryFn: getInvites });

export function useInvites() {
  return useSuspenseQuery(getInvitesQueryOptions());
}
