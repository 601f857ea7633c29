import type { AddressInfo } from "node:net";
import { simpleParser, type AddressObject } from "mailparser";
import { SMTPServer } from "smtp-server";

export interface CapturedMail {
  messageId: string | null;
  from: string;
  to: string;
  subject: string;
  text: string | null;
  html: string | null;
  teamId: number | null;
}

export interface FakeSmtp {
  host: string;
  port: number;
  close(): Promise<void>;
}

export const TEAM_HEADER = "x-stillpoint-team";

function addresses(value: AddressObject | AddressObject[] | undefined): string {
  if (!value) return "";
  return (Array.isArray(value) ? value : [value]).map((a) => a.text).join(", ");
}

/**
 * A development-only SMTP server on a free loopback port. Each message is parsed and handed to `store`
 * before the client gets its 250 reply, so a sent message is stored by the time `sendMail` resolves.
 */
export async function startFakeSmtp(store: (mail: CapturedMail) => Promise<void>, onError: (error: unknown) => void): Promise<FakeSmtp> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    disableReverseLookup: true,
    logger: false,
    size: 10 * 1024 * 1024,
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then(async (parsed) => {
          const teamHeader = parsed.headers.get(TEAM_HEADER);
          const teamId = typeof teamHeader === "string" && /^\d+$/.test(teamHeader) ? Number(teamHeader) : null;
          await store({
            messageId: parsed.messageId ?? null,
            from: addresses(parsed.from),
            to: addresses(parsed.to),
            subject: parsed.subject ?? "",
            text: parsed.text ?? null,
            html: typeof parsed.html === "string" ? parsed.html : null,
            teamId,
          });
          callback();
        })
        .catch((error: unknown) => {
          onError(error);
          callback(error instanceof Error ? error : new Error(String(error)));
        });
    },
  });
  await new Promise<void>((resolve, reject) => {
    server.once("error", reject);
    server.listen(0, "127.0.0.1", () => {
      server.off("error", reject);
      resolve();
    });
  });
  server.on("error", onError);
  const { port } = server.server.address() as AddressInfo;
  return {
    host: "127.0.0.1",
    port,
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
