import { GraphStore } from "../../../../workers/src/graph-store/load";
import { resolveSeedIds, UnknownSeedsError } from "../../../../workers/src/runner/seeds";
import type { Seed } from "../../../contracts/runs";
import { AppError, ERRORS } from "../../lib/errors";

/** Checks every seed id against the prepared graph's id dictionary; 400 `unknown_seeds` lists the ones it lacks. */
export async function checkSeeds(graphDir: string, seeds: readonly Seed[]): Promise<void> {
  const store = await GraphStore.open(graphDir, { verify: false });
  const ids = await store.loadIds();
  try {
    resolveSeedIds(seeds, ids);
  } catch (error) {
    if (!(error instanceof UnknownSeedsError)) throw error;
    throw new AppError(ERRORS.unknownSeeds, { message: error.message, details: { unknown: error.unknown.slice(0, 1000), count: error.unknown.length } });
  }
}
