import { pino, type DestinationStream, type Logger } from "pino";

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

export function createLogger(level: string, destination?: DestinationStream): Logger {
  const options = { level, redact: { paths: REDACT, censor: "[redacted]" }, base: { app: "stillpoint" } };
  return destination ? pino(options, destination) : pino(options);
}

// Invite and reset links carry their secret in the path.
const SECRET_IN_PATH = /(\/api\/invites\/|\/api\/auth\/password-reset\/)[^/?#]+/g;
// An API token pasted into a URL by mistake (the API refuses it there, but the request is still logged).
const API_TOKEN = /spt_[A-Za-z0-9_-]+/g;

export function redactUrl(url: string): string {
  return url.replace(SECRET_IN_PATH, "$1[redacted]").replace(API_TOKEN, "spt_[redacted]");
}
