import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

export const PasswordResetRequestSchema = z.object({
  email: z.email("Enter an e-mail address like name@example.org."),
});
export type PasswordResetRequest = z.infer<typeof PasswordResetRequestSchema>;

export function requestPasswordReset(input: PasswordResetRequest) {
  return api.post("/auth/password-reset", input, null, { on401: "throw" });
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
