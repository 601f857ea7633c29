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

/** Names of the invisible characters that change how the text around them is ordered on screen. */
const DIRECTION_CHARACTERS: Readonly<Record<number, string>> = {
  0x061c: "arabic letter mark",
  0x200e: "left-to-right mark",
  0x200f: "right-to-left mark",
  0x202a: "left-to-right embedding",
  0x202b: "right-to-left embedding",
  0x202c: "pop directional formatting",
  0x202d: "left-to-right override",
  0x202e: "right-to-left override",
  0x2066: "left-to-right isolate",
  0x2067: "right-to-left isolate",
  0x2068: "first strong isolate",
  0x2069: "pop directional isolate",
};
const HIDDEN_CHARACTER = /[\u0000-\u001f\u007f-\u009f\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/u;

/** `U+202E` style. */
export function codePointLabel(codePoint: number): string {
  return `U+${codePoint.toString(16).toUpperCase().padStart(4, "0")}`;
}

/**
 * A trimmed one-line name that others will read: control characters and text-direction marks, embeddings, overrides
 * and isolates are refused (they can make a name display as something else), naming the code point and position.
 */
export function plainNameSchema(label: string, max: number, emptyMessage: string) {
  return z
    .string()
    .trim()
    .min(1, emptyMessage)
    .max(max)
    .superRefine((value, ctx) => {
      const match = HIDDEN_CHARACTER.exec(value);
      if (!match) return;
      const codePoint = match[0].codePointAt(0) ?? 0;
      const position = [...value.slice(0, match.index)].length + 1;
      const kind = DIRECTION_CHARACTERS[codePoint] ?? "a control character";
      ctx.addIssue({
        code: "custom",
        message: `The ${label} contains ${codePointLabel(codePoint)} (${kind}) at character ${position}; control and text-direction characters are not allowed.`,
        params: { codePoint: codePointLabel(codePoint), position },
      });
    });
}
