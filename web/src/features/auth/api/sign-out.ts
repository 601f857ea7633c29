import { useMutation } from "@tanstack/react-query";
import { paths } from "../../../config/paths";
import { api, setCsrfToken } from "../../../lib/api-client";

export function signOut() {
  return api.post("/auth/sign-out", undefined, null, { on401: "throw" });
}

export function useSignOut() {
  return useMutation({
    mutationFn: signOut,
    onSettled: () => {
      setCsrfToken(null);
      // A full page load drops every cached query and component state of the signed-out user at once.
      window.location.assign(paths.auth.signIn.getHref());
    },
  });
}
