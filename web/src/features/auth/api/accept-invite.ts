import { useMutation, useQueryClient } from "@tanstack/react-query";
import { SessionSchema } from "../../../../../api/contracts/auth";
import { AcceptInviteSchema, type AcceptInvite } from "../../../../../api/contracts/team";
import { api } from "../../../lib/api-client";
import { rememberSession } from "../../../lib/auth";

export { AcceptInviteSchema };

export function acceptInvite({ token, ...input }: AcceptInvite & { token: string }) {
  return api.post(`/invites/${encodeURIComponent(token)}/accept`, input, SessionSchema, { on401: "throw" });
}

/** Accepting signs the new member in. */
export function useAcceptInvite() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: acceptInvite,
    onSuccess: (session) => {
      // Drop whatever an earlier user left cached, but keep the invitation: refetching it now would answer 410.
      queryClient.removeQueries({ predicate: (query) => query.queryKey[0] !== "invites" });
      rememberSession(queryClient, session);
    },
  });
}
