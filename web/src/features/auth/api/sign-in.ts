import { useMutation, useQueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";
import { SessionSchema, rememberSession } from "../../../lib/auth";

export const SignInInputSchema = z.object({
  email: z.email("Enter an e-mail address like name@example.org."),
  password: z.string().min(1, "Enter your password."),
});
export type SignInInput = z.infer<typeof SignInInputSchema>;

export function signIn(input: SignInInput) {
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
