import { useMutation } from "@tanstack/react-query";
import { PasswordResetAcceptedSchema, PasswordResetRequestSchema, type PasswordResetRequest } from "../../../../../api/contracts/auth";
import { api } from "../../../lib/api-client";

export { PasswordResetRequestSchema };

export function requestPasswordReset(input: PasswordResetRequest) {
  return api.post("/auth/password-reset", input, PasswordResetAcceptedSchema, { on401: "throw" });
}

export function useRequestPasswordReset() {
  return useMutation({ mutationFn: requestPasswordReset });
}
