import { z } from "zod";
import { EmailSchema, IdSchema, RoleSchema } from "./common";

/** Mirrors the server's policy so forms can tell early; the server decides (it also refuses the e-mail address). */
export const PasswordSchema = z.string().min(10, "Use at least 10 characters.").max(200);

export const SignInRequestSchema = z.strictObject({
  email: EmailSchema,
  password: z.string().min(1, "Enter your password.").max(200),
});
export type SignInRequest = z.infer<typeof SignInRequestSchema>;

export const UserSchema = z.object({ id: IdSchema, email: z.string(), name: z.string() });
export type User = z.infer<typeof UserSchema>;

export const TeamRefSchema = z.object({ id: IdSchema, name: z.string() });
export type TeamRef = z.infer<typeof TeamRefSchema>;

/**
 * The signed-in caller. `csrfToken` goes back in the `X-CSRF-Token` header of every cookie-authenticated mutation.
 * @example { "user": { "id": 1, "email": "admin@kestrel.example", "name": "Harbour Admin" },
 *            "team": { "id": 1, "name": "Kestrel Isles Data Office" }, "role": "admin", "csrfToken": "…" }
 */
export const SessionSchema = z.object({
  user: UserSchema,
  team: TeamRefSchema,
  role: RoleSchema,
  csrfToken: z.string(),
});
export type Session = z.infer<typeof SessionSchema>;

export const PasswordResetRequestSchema = z.strictObject({ email: EmailSchema });
export type PasswordResetRequest = z.infer<typeof PasswordResetRequestSchema>;

export const PasswordResetAcceptedSchema = z.object({ accepted: z.literal(true) });

export const PasswordResetConfirmSchema = z.strictObject({ password: PasswordSchema });
export type PasswordResetConfirm = z.infer<typeof PasswordResetConfirmSchema>;

export const TokenParamSchema = z.strictObject({ token: z.string().min(10).max(200) });
