import type { Health } from "../../../contracts/health";
import type { AppDeps } from "../../deps";
import { AppError, ERRORS } from "../../lib/errors";
import { pingDatabase } from "./health.repo";

const PING_TIMEOUT_MS = 2_000;

export async function checkHealth(deps: AppDeps): Promise<Health> {
  let timer: NodeJS.Timeout | undefined;
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error("database ping timed out")), PING_TIMEOUT_MS);
  });
  try {
    await Promise.race([pingDatabase(deps.db), timeout]);
  } catch (error) {
    throw new AppError(ERRORS.dbUnavailable, { cause: error });
  } finally {
    clearTimeout(timer);
  }
  return { ok: true };
}
