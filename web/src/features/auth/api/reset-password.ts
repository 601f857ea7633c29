import { useMutation } from "@tanstack/react-query";
import { z } from "zod";
import { api } from "../../../lib/api-client";

export const NewPasswordSchema = z
  .string()
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.");

export function resetPassword({ token, password }: { token: string; password: string }) {
  return api.post(`/auth/password-reset/${encodeURIComponent(token)}`, { password }, null, { on401: "throw" });
}

export function useResetPassword() {
  return useMutation({ mutationFn: resetPassword });
}
