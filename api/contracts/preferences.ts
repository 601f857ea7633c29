import { z } from "zod";

/** `PATCH /api/auth/me`: the caller's own settings. `notify: false` stops every run e-mail to them. */
export const UpdateMeSchema = z.strictObject({ notify: z.boolean() });
export type UpdateMe = z.infer<typeof UpdateMeSchema>;

export const PreferencesSchema = z.object({ notify: z.boolean() });
export type Preferences = z.infer<typeof PreferencesSchema>;
