import type { Role } from "./auth";

// The UI hides what a role cannot do; the API enforces the same rules on every mutation.
const POLICY = {
  "team:view": ["admin", "engineer", "viewer"],
  "team:manage": ["admin"],
  "activity:view": ["admin"],
  "outbox:view": ["admin"],
  "tokens:create": ["admin", "engineer"],
  "runs:submit": ["admin", "engineer"],
  "runs:cancel": ["admin", "engineer"],
  "runs:retry": ["admin", "engineer"],
  "graphs:create": ["admin", "engineer"],
  "graphs:delete": ["admin", "engineer"],
  "uploads:create": ["admin", "engineer"],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof POLICY;

export function can(role: Role, permission: Permission): boolean {
  return (POLICY[permission] as readonly Role[]).includes(role);
}
