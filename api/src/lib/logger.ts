import { pino, type Logger } from "pino";

export type { Logger };

// Secrets never reach the log: credentials, cookies and tokens are censored wherever they appear.
const REDACT = [
  "req.headers.authorization",
  "req.headers.cookie",
  "req.headers[\"x-csrf-token\"]",
  "res.headers[\"set-cookie\"]",
  "*.password",
  "*.token",
  "*.csrfToken",
  "*.passwordHash",
];

export function createLogger(level: string): Logger {
  return pino({ level, redact: { paths: REDACT, censor: "[redacted]" }, base: { app: "stillpoint" } });
}
