import { and, desc, eq, lt } from "drizzle-orm";
import { emails } from "../../db/schema";
import type { Executor } from "../../lib/db";

export interface EmailRecord {
  teamId: number | null;
  messageId: string | null;
  from: string;
  to: string;
  subject: string;
  text: string | null;
  html: string | null;
  state: "captured" | "sent" | "failed";
  error?: string | null;
}

export async function insertEmail(db: Executor, mail: EmailRecord): Promise<void> {
  await db.insert(emails).values({
    teamId: mail.teamId,
    messageId: mail.messageId?.slice(0, 255) ?? null,
    fromAddress: mail.from.slice(0, 320),
    toAddress: mail.to.slice(0, 1024),
    subject: mail.subject.slice(0, 255),
    textBody: mail.text,
    htmlBody: mail.html,
    state: mail.state,
    error: mail.error ?? null,
  });
}

/** One team's captured mail: other teams' invite and reset links must never show up in it. */
export async function listEmails(db: Executor, teamId: number, beforeId: number | null, limit: number) {
  return db
    .select({
      id: emails.id,
      from: emails.fromAddress,
      to: emails.toAddress,
      subject: emails.subject,
      text: emails.textBody,
      html: emails.htmlBody,
      state: emails.state,
      createdAt: emails.createdAt,
    })
    .from(emails)
    .where(and(eq(emails.teamId, teamId), beforeId === null ? undefined : lt(emails.id, beforeId)))
    .orderBy(desc(emails.id))
    .limit(limit);
}
