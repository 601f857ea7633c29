// Database calls that survive a lost connection or a database restart: retried with capped exponential backoff.
// Every write the runner makes is idempotent (upserts keyed by run and k, absolute SETs), so repeating a statement
// whose reply was lost changes nothing.
import { setTimeout as sleep } from "node:timers/promises";

const TRANSIENT_CODES = new Set([
  "ECONNREFUSED",
  "ECONNRESET",
  "EPIPE",
  "ETIMEDOUT",
  "EHOSTUNREACH",
  "ENETUNREACH",
  "EAI_AGAIN",
  "PROTOCOL_CONNECTION_LOST",
  "PROTOCOL_SEQUENCE_TIMEOUT",
  "ER_SERVER_SHUTDOWN",
  "ER_CON_COUNT_ERROR",
  "ER_CONNECTION_KILLED",
  "ER_LOCK_DEADLOCK",
  "ER_LOCK_WAIT_TIMEOUT",
  "ER_QUERY_INTERRUPTED",
]);

const TRANSIENT_MESSAGES = [/connection is in closed state/i, /connection lost/i, /server has gone away/i, /read ECONNRESET/i];

/** True for errors that a new connection may cure: walks the `cause` chain (drizzle wraps driver errors). */
export function isTransientDbError(error: unknown): boolean {
  for (let e: unknown = error, depth = 0; e && depth < 6; depth++) {
    if (typeof e !== "object") return false;
    const { code, fatal, message, cause } = e as { code?: unknown; fatal?: unknown; message?: unknown; cause?: unknown };
    if (typeof code === "string" && TRANSIENT_CODES.has(code)) return true;
    if (fatal === true) return true;
    if (typeof message === "string" && TRANSIENT_MESSAGES.some((re) => re.test(message))) return true;
    e = cause;
  }
  return false;
}

export interface RetryHooks {
  /** Called once per failed attempt with the attempt number and the error. */
  onRetry?(attempt: number, error: unknown, what: string): void;
  /** Called once when a call succeeds after failed attempts. */
  onRecovered?(attempts: number, what: string): void;
  /** When it returns true the next transient failure is thrown instead of retried (shutting down for good). */
  giveUp?(): boolean;
}

export const BACKOFF_FIRST_MS = 100;
export const BACKOFF_MAX_MS = 5_000;

/** Runs `fn`; transient failures are retried after 100 ms, 200 ms, … up to 5 s apart, others are thrown at once. */
export async function retryDb<T>(what: string, fn: () => Promise<T>, hooks: RetryHooks = {}): Promise<T> {
  for (let attempt = 1; ; attempt++) {
    try {
      const value = await fn();
      if (attempt > 1) hooks.onRecovered?.(attempt, what);
      return value;
    } catch (error) {
      if (!isTransientDbError(error) || hooks.giveUp?.()) throw error;
      hooks.onRetry?.(attempt, error, what);
      await sleep(Math.min(BACKOFF_MAX_MS, BACKOFF_FIRST_MS * 2 ** (attempt - 1)));
    }
  }
}
