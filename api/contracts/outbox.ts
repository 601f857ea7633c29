import { z } from "zod";
import { IdSchema, pageSchema, PageQuerySchema, TimestampSchema } from "./common";

export const OutboxMessageSchema = z.object({
  id: IdSchema,
  from: z.string(),
  to: z.string(),
  subject: z.string(),
  text: z.string().nullable(),
  html: z.string().nullable(),
  state: z.enum(["captured", "sent", "failed"]),
  createdAt: TimestampSchema,
});
export type OutboxMessage = z.infer<typeof OutboxMessageSchema>;

export const OutboxQuerySchema = PageQuerySchema;
export const OutboxPageSchema = pageSchema(OutboxMessageSchema);
export type OutboxPage = z.infer<typeof OutboxPageSchema>;
