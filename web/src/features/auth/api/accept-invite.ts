import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { SessionSchema, rememberSession } from "../../../lib/auth";
import { NewPasswordSchema } from "./reset-password";

export const AcceptInviteInputSchema = z.object({
  name: z.string().trim().min(1, "Enter your name.").max(120, "Use at most 120 characters."),
  password: NewPasswordSchema,
});
export type AcceptInviteInput = z.infer<typeof AcceptInviteInputSchema>;

export async function acceptInvite({ token, ...input }: AcceptInviteInput & { token: string }) {
  const body = await api.post(`/invites/${encodeURIComponent(token)}/accept`, input, z.unknown(), { on401: "throw" });
  // The server may sign the new member in straight away; if it does not, they sign in next.
  const session = SessionSchema.safeParse(body);
  return session.success ? session.data : null;
}

export function useAcceptInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvite,
    onSuccess: (session) => {
      if (session) {
        queryClient.clear();
        rememberSession(queryClient, session);
      }
    },
  });
}
