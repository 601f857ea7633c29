import { queryOptions, useQuery, type QueryClient } from "@tanstack/react-query";
import { z } from "zod";
import { ApiError, api, setCsrfToken } from "./api-client";

// Provisional until the shared auth contract lands; mirrors the documented session shape.
const IdSchema = z.union([z.string(), z.number()]).transform(String);
export const RoleSchema = z.enum(["admin", "engineer", "viewer"]);
export type Role = z.infer<typeof RoleSchema>;

export const SessionSchema = z.object({
  user: z.object({ id: IdSchema, email: z.string(), name: z.string().nullish() }),
  team: z.object({ id: IdSchema, name: z.string() }),
  role: RoleSchema,
  csrfToken: z.string(),
});
export type Session = z.infer<typeof SessionSchema>;

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
