import path from "node:path";
import { SCORE_INDEX_FILE, ScoreIndexFormatError } from "../../../../workers/src/score-index/format";
import { scoreIndexFromArrow } from "../../../../workers/src/score-index/from-arrow";
import { ScoreIndex } from "../../../../workers/src/score-index/read";
import { outputsOf, scoreFile } from "./score-files";
import type { RunRow } from "./runs.repo";

// One build per file at a time: concurrent first requests for an old run wait for the same pass over its Arrow file.
const building = new Map<string, Promise<unknown>>();

async function openIfUsable(file: string, nodes: number): Promise<ScoreIndex | null> {
  let index: ScoreIndex;
  try {
    index = await ScoreIndex.open(file);
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT" || error instanceof ScoreIndexFormatError) return null;
    throw error;
  }
  if (nodes > 0 && index.n !== nodes) {
    await index.close();
    return null;
  }
  return index;
}

/**
 * The run's score index, beside its score files. Runs written before the runner made one (or with an index of an
 * older format) get it built from their Arrow file on first use. 409 when the run has no score files.
 */
export async function openScoreIndex(dataDir: string, run: RunRow): Promise<ScoreIndex> {
  const arrow = await scoreFile(dataDir, run, "arrow");
  const file = path.join(path.dirname(arrow.path), SCORE_INDEX_FILE);
  const nodes = outputsOf(run)?.nodes ?? 0;
  const ready = await openIfUsable(file, nodes);
  if (ready) return ready;
  let pending = building.get(file);
  if (!pending) {
    pending = scoreIndexFromArrow(arrow.path, file).finally(() => building.delete(file));
    building.set(file, pending);
  }
  await pending;
  const built = await openIfUsable(file, nodes);
  if (!built) throw new Error(`${file}: the score index built from ${arrow.path} does not match the run (${nodes} nodes)`);
  return built;
}

/** Opens the run's score index, hands it to `use`, and closes it afterwards. */
export async function withScoreIndex<T>(dataDir: string, run: RunRow, use: (index: ScoreIndex) => Promise<T>): Promise<T> {
  const index = await openScoreIndex(dataDir, run);
  try {
    return await use(index);
  } finally {
    await index.close();
  }
}
