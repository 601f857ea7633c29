// Run e-mails to the submitter: finished (converged or not), failed, needs attention. Sent only when both the run's
// notify flag and the user's own setting allow it; a mail problem is logged, never fatal to the run.
import { createMailer, type Mailer, type MailerOptions } from "../../../api/src/lib/mail/mailer";
import { storeCapturedMail, storeDelivery } from "../../../api/src/features/outbox/outbox.service";
import type { Db } from "../../../api/src/lib/db";
import type { Logger } from "../../../api/src/lib/logger";
import type { RunnerConfig } from "./config";
import type { RunnerContext } from "./context";
import { notifyAddress, type RunRow } from "./queue-repo";
import type { FinalStatus } from "./run-repo";

/**
 * The runner's mailer. With the development mail fake the message goes straight to the outbox table (the fake SMTP
 * server lives in the HTTP process, on a port the runner does not know); otherwise through SMTP, recorded like the
 * API's own mail.
 */
export function createRunnerMailer(config: RunnerConfig, db: Db, logger: Logger): Mailer {
  const onError = (error: unknown) => logger.error({ err: error }, "mail problem");
  const transport: MailerOptions["transport"] = !config.mail.fake && config.mail.smtpUrl ? config.mail.smtpUrl : { jsonTransport: true };
  return createMailer({
    transport,
    from: config.mail.from,
    record: config.mail.fake
      ? (d) => storeCapturedMail(db, { messageId: d.messageId, from: d.from, to: d.to, subject: d.subject, text: d.text, html: d.html, teamId: d.teamId })
      : (d) => storeDelivery(db, d),
    onError,
  });
}

const HEADLINE: Record<Exclude<FinalStatus, "canceled">, string> = {
  converged: "converged",
  "not-converged": "finished without converging",
  "needs-attention": "needs attention",
  failed: "failed",
};

export interface RunOutcome {
  status: FinalStatus;
  reason: string | null;
  iterations: number;
  residual: number | null;
  errorBound: number | null;
}

export async function sendRunMail(ctx: RunnerContext, run: RunRow, graphName: string, outcome: RunOutcome): Promise<void> {
  if (outcome.status === "canceled") return;
  try {
    const to = await ctx.retry("find notify address", () => notifyAddress(ctx.db, run));
    if (!to) return;
    const link = `${ctx.config.publicUrl}/runs/${run.id}`;
    const headline = HEADLINE[outcome.status];
    const lines = [
      `Run ${run.id} on the graph "${graphName}" ${headline}.`,
      "",
      `Iterations: ${outcome.iterations}`,
      ...(outcome.residual !== null && Number.isFinite(outcome.residual) ? [`Final L1 residual: ${outcome.residual.toExponential(3)}`] : []),
      ...(outcome.errorBound !== null && Number.isFinite(outcome.errorBound) ? [`Certified error bound: ${outcome.errorBound.toExponential(3)}`] : []),
      ...(outcome.reason ? ["", outcome.reason] : []),
      ...(outcome.status === "needs-attention" ? ["", "Retry the failed shards from the run page; the run resumes from its last checkpoint."] : []),
      "",
      `Open the run: ${link}`,
      "",
      "Scores are a signal for human review, not a verdict on a person or site.",
    ];
    await ctx.mailer.send({ to, subject: `Stillpoint: run ${run.id} on "${graphName}" ${headline}`, text: lines.join("\n"), teamId: run.teamId });
  } catch (error) {
    ctx.logger.error({ err: error, runId: run.id }, "run e-mail not sent");
  }
}
