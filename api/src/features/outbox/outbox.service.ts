import type { PageQuery } from "../../../contracts/common";
import type { OutboxPage } from "../../../contracts/outbox";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { decodeCursor, encodeCursor } from "../../lib/cursor";
import type { Executor } from "../../lib/db";
import { AppError, ERRORS } from "../../lib/errors";
import type { CapturedMail } from "../../lib/mail/fake-smtp";
import type { DeliveryRecord } from "../../lib/mail/mailer";
import { insertEmail, listEmails } from "./outbox.repo";

export function storeCapturedMail(db: Executor, mail: CapturedMail): Promise<void> {
  return insertEmail(db, { ...mail, state: "captured" });
}

export function storeDelivery(db: Executor, delivery: DeliveryRecord): Promise<void> {
  return insertEmail(db, { ...delivery, state: delivery.error ? "failed" : "sent" });
}

export async function getOutboxPage(deps: AppDeps, principal: Principal, query: PageQuery): Promise<OutboxPage> {
  if (!deps.outboxEnabled) throw new AppError(ERRORS.routeNotFound);
  const rows = await listEmails(deps.db, principal.teamId, decodeCursor(query.cursor), query.limit + 1);
  const page = rows.slice(0, query.limit);
  const last = page.at(-1);
  return {
    items: page.map((row) => ({ ...row, createdAt: row.createdAt.toISOString() })),
    nextCursor: rows.length > query.limit && last ? encodeCursor(last.id) : null,
  };
}
