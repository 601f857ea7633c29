import { queryOptions, useQuery } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { RoleSchema } from "../../../lib/auth";

// Provisional until the shared invites contract lands.
export const InvitePreviewSchema = z.object({
  email: z.string(),
  role: RoleSchema,
  teamName: z.string().optional(),
  team: z.object({ name: z.string() }).optional(),
  expiresAt: z.string().nullish(),
});
export type InvitePreview = z.infer<typeof InvitePreviewSchema>;

export function getInvite(token: string) {
  return api.get(`/invites/${encodeURIComponent(token)}`, InvitePreviewSchema, { on401: "throw" });
}

export const getInviteQueryOptions = (token: string) =>
  queryOptions({ queryKey: ["invites", "public", token], queryFn: () => getInvite(token), retry: false });

export function useInvite(token: string) {
  return useQuery(getInviteQueryOptions(token));
}
