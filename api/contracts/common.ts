import { z } from "zod";

export const ROLE_VALUES = ["admin", "engineer", "viewer"] as const;
export const RoleSchema = z.enum(ROLE_VALUES);
export type Role = z.infer<typeof RoleSchema>;

/** Each role includes every permission of the roles after it: admin ⊃ engineer ⊃ viewer. */
export const ROLE_RANK: Record<Role, number> = { admin: 3, engineer: 2, viewer: 1 };

export const IdSchema = z.number().int().positive();
/** A numeric id taken from a URL path segment. */
export const IdParamSchema = z.coerce.number().int().positive();
/** ISO 8601 in UTC, e.g. `2025-03-01T09:30:00.000Z`. */
export const TimestampSchema = z.iso.datetime();

export const EmailSchema = z
  .string()
  .trim()
  .toLowerCase()
  .max(254)
  .pipe(z.email({ message: "Enter a valid e-mail address." }));

export const ErrorBodySchema = z.object({
  error: z.object({
    code: z.string(),
    message: z.string(),
    details: z.unknown(),
  }),
});
export type ErrorBody = z.infer<typeof ErrorBodySchema>;

export const OkSchema = z.object({ ok: z.literal(true) });
export type Ok = z.infer<typeof OkSchema>;

export const PageQuerySchema = z.strictObject({
  cursor: z.string().max(200).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
});
export type PageQuery = z.infer<typeof PageQuerySchema>;

/** A page of a cursor-paginated list; `nextCursor` is null on the last page. */
export function pageSchema<T extends z.ZodType>(item: T) {
  return z.object({ items: z.array(item), nextCursor: z.string().nullable() });
}
