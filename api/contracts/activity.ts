import { z } from "zod";
import { IdSchema, pageSchema, PageQuerySchema, TimestampSchema } from "./common";

export const ActivityItemSchema = z.object({
  id: IdSchema,
  action: z.string(),
  actor: z.object({ userId: IdSchema, name: z.string(), email: z.string() }).nullable(),
  viaToken: z.boolean(),
  target: z.string().nullable(),
  details: z.record(z.string(), z.unknown()).nullable(),
  ip: z.string().nullable(),
  createdAt: TimestampSchema,
});
export type ActivityItem = z.infer<typeof ActivityItemSchema>;

export const ActivityQuerySchema = PageQuerySchema;
export const ActivityPageSchema = pageSchema(ActivityItemSchema);
export type ActivityPage = z.infer<typeof ActivityPageSchema>;
