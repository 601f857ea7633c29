import { useMutation, useQueryClient } from "@tanstack/react-query";
import { SessionSchema, SignInRequestSchema, type SignInRequest } from "../../../../../api/contracts/auth";
import { api } from "../../../lib/api-client";
import { rememberSession } from "../../../lib/auth";

export { SignInRequestSchema };

export function signIn(input: SignInRequest) {
  return api.post("/auth/sign-in", input, SessionSchema, { on401: "throw" });
}

export function useSignIn() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signIn,
    onSuccess: (session) => {
      // Nothing cached for a previous user may leak into this session.
      queryClient.clear();
      rememberSession(queryClient, session);
    },
  });
}
