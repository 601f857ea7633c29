import { useMutation, useQueryClient } from "@tanstack/react-query";
import { api } from "../../../lib/api-client";
import { rememberSession } from "../../../lib/auth";

export function signOut() {
  return api.post("/auth/sign-out", undefined, null, { on401: "throw" });
}

export function useSignOut() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      queryClient.clear();
      rememberSession(queryClient, null);
    },
  });
}
