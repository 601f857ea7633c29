import { z } from "zod";
import { PasswordSchema, TeamRefSchema } from "./auth";
import { EmailSchema, IdParamSchema, IdSchema, RoleSchema, TimestampSchema } from "./common";

export const MemberSchema = z.object({
  userId: IdSchema,
  email: z.string(),
  name: z.string(),
  role: RoleSchema,
  joinedAt: TimestampSchema,
});
export type Member = z.infer<typeof MemberSchema>;

export const TeamSchema = z.object({ team: TeamRefSchema, members: z.array(MemberSchema) });
export type Team = z.infer<typeof TeamSchema>;

export const MemberParamsSchema = z.strictObject({ userId: IdParamSchema });
export const UpdateMemberSchema = z.strictObject({ role: RoleSchema });
export type UpdateMember = z.infer<typeof UpdateMemberSchema>;

export const CreateInviteSchema = z.strictObject({ email: EmailSchema, role: RoleSchema });
export type CreateInvite = z.infer<typeof CreateInviteSchema>;

export const InviteSchema = z.object({
  id: IdSchema,
  email: z.string(),
  role: RoleSchema,
  invitedBy: z.string().nullable(),
  createdAt: TimestampSchema,
  expiresAt: TimestampSchema,
});
export type Invite = z.infer<typeof InviteSchema>;

export const InviteListSchema = z.object({ items: z.array(InviteSchema) });
export const InviteParamsSchema = z.strictObject({ id: IdParamSchema });

/** What the public invite page shows before the invitee chooses a password. */
export const InvitePreviewSchema = z.object({
  email: z.string(),
  team: TeamRefSchema,
  role: RoleSchema,
  expiresAt: TimestampSchema,
  existingAccount: z.boolean(),
});
export type InvitePreview = z.infer<typeof InvitePreviewSchema>;

/** An invitee who already has an account gives its password; `name` is then ignored. */
export const AcceptInviteSchema = z.strictObject({
  name: z.string().trim().min(1, "Enter your name.").max(120),
  password: PasswordSchema,
});
export type AcceptInvite = z.infer<typeof AcceptInviteSchema>;
