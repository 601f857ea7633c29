import { z } from "zod";
import { IdParamSchema, IdSchema, TimestampSchema } from "./common";

export const CreateTokenSchema = z.strictObject({ name: z.string().trim().min(1, "Name the token.").max(80) });
export type CreateToken = z.infer<typeof CreateTokenSchema>;

/** Returned once at creation: the plain token is never shown again. */
export const CreatedTokenSchema = z.object({ id: IdSchema, name: z.string(), token: z.string() });
export type CreatedToken = z.infer<typeof CreatedTokenSchema>;

export const TokenSummarySchema = z.object({
  id: IdSchema,
  name: z.string(),
  /** The first characters of the token, enough to recognise it. */
  hint: z.string(),
  createdAt: TimestampSchema,
  lastUsedAt: TimestampSchema.nullable(),
  revokedAt: TimestampSchema.nullable(),
});
export type TokenSummary = z.infer<typeof TokenSummarySchema>;

export const TokenListSchema = z.object({ items: z.array(TokenSummarySchema) });
export const TokenParamsSchema = z.strictObject({ id: IdParamSchema });
