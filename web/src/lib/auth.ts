import { queryOptions, useQuery, type QueryClient } from "@tanstack/react-query";
import { SessionSchema, type Session } from "../../../api/contracts/auth";
import { RoleSchema, type Role } from "../../../api/contracts/common";
import { ApiError, api, setCsrfToken } from "./api-client";

export type { Role, Session };

export const sessionQueryKey = ["auth", "me"] as const;

export async function getSession(): Promise<Session | null> {
  try {
    const session = await api.get("/auth/me", SessionSchema, { on401: "throw" });
    setCsrfToken(session.csrfToken);
    return session;
  } catch (error) {
    if (error instanceof ApiError && error.status === 401) {
      setCsrfToken(null);
      return null;
    }
    throw error;
  }
}

export const sessionQueryOptions = () =>
  queryOptions({ queryKey: sessionQueryKey, queryFn: getSession, staleTime: Infinity, retry: false });

export function rememberSession(queryClient: QueryClient, session: Session | null): void {
  setCsrfToken(session?.csrfToken ?? null);
  queryClient.setQueryData(sessionQueryKey, session);
}

/** Inside the signed-in layout the loader has already ensured a session. */
export function useSession(): Session {
  const { data } = useQuery(sessionQueryOptions());
  if (!data) throw new ApiError(401, "unauthenticated", "You are signed out. Sign in again to continue.");
  return data;
}

export const ROLE_LABELS: Record<Role, string> = {
  admin: "Admin",
  engineer: "Engineer",
  viewer: "Viewer",
};

export const ROLE_OPTIONS = RoleSchema.options.map((role) => ({ value: role, label: ROLE_LABELS[role] }));

export const ROLE_TONES = { admin: "accent", engineer: "ink", viewer: "neutral" } as const satisfies Record<Role, string>;

export function parseRole(value: string): Role {
  return RoleSchema.parse(value);
}
