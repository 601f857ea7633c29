import nodemailer, { type Transporter } from "nodemailer";
import { TEAM_HEADER } from "./fake-smtp";

export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
  teamId?: number | null;
}

export interface DeliveryRecord {
  messageId: string | null;
  from: string;
  to: string;
  subject: string;
  text: string;
  html: string | null;
  teamId: number | null;
  error: string | null;
}

export interface Mailer {
  /** Sends one message; delivery problems are reported in the result, never thrown. */
  send(mail: OutgoingMail): Promise<{ delivered: boolean }>;
  close(): void;
}

export interface MailerOptions {
  /** An SMTP URL, a loopback SMTP server without TLS, or a JSON transport that only records (no mail server configured). */
  transport: string | { host: string; port: number } | { jsonTransport: true };
  from: string;
  /** Called after every attempt with what was sent (production keeps its own outbox record). */
  record?: (delivery: DeliveryRecord) => Promise<void>;
  onError?: (error: unknown) => void;
}

export function createMailer(options: MailerOptions): Mailer {
  const t = options.transport;
  const transporter: Transporter =
    typeof t === "string" || "jsonTransport" in t
      ? nodemailer.createTransport(t)
      : nodemailer.createTransport({ host: t.host, port: t.port, secure: false, ignoreTLS: true });
  return {
    async send(mail) {
      let messageId: string | null = null;
      let failure: string | null = null;
      try {
        const info = await transporter.sendMail({
          from: options.from,
          to: mail.to,
          subject: mail.subject,
          text: mail.text,
          html: mail.html,
          headers: mail.teamId ? { [TEAM_HEADER]: String(mail.teamId) } : undefined,
        });
        messageId = info.messageId ?? null;
      } catch (error) {
        failure = error instanceof Error ? error.message : String(error);
        options.onError?.(error);
      }
      if (options.record) {
        await options
          .record({
            messageId,
            from: options.from,
            to: mail.to,
            subject: mail.subject,
            text: mail.text,
            html: mail.html ?? null,
            teamId: mail.teamId ?? null,
            error: failure,
          })
          .catch((error: unknown) => options.onError?.(error));
      }
      return { delivered: failure === null };
    },
    close() {
      transporter.close();
    },
  };
}
