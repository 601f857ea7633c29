import { useMutation } from "@tanstack/react-query";
import { PasswordSchema, type PasswordResetConfirm } from "../../../../../api/contracts/auth";
import { api } from "../../../lib/api-client";

export { PasswordSchema };

export function resetPassword({ token, password }: PasswordResetConfirm & { token: string }) {
  return api.post(`/auth/password-reset/${encodeURIComponent(token)}`, { password }, null, { on401: "throw" });
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
