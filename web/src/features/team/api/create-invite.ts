import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { RoleSchema } from "../../../lib/auth";
import { getInvitesQueryOptions } from "./get-invites";

export const CreateInviteInputSchema = z.object({
  email: z.email("Enter an e-mail address like name@example.org."),
  role: RoleSchema,
});
export type CreateInviteInput = z.infer<typeof CreateInviteInputSchema>;

export function createInvite(input: CreateInviteInput) {
  return api.post("/team/invites", input, z.unknown());
}

export function useCreateInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: createInvite,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: getInvitesQueryOptions().queryKey }),
  });
}
