// The stillpoint command line. Exit codes: 0 done (a run that hits the iteration cap is a result, not an error),
// 2 bad input (file, line and reason on stderr), 1 anything else.

import { Command, InvalidArgumentError } from "commander";
import { GraphStoreError } from "../graph-store/format";
import { IngestError } from "../ingest/errors";
import { humanReport, rankCommand, UsageError, type RankCommandOptions } from "./rank-command";
import { SeedError } from "./seeds";

export const EXIT_OK = 0;
export const EXIT_FAILED = 1;
export const EXIT_BAD_INPUT = 2;

function number(name: string, check: (v: number) => boolean, rule: string) {
  return (text: string): number => {
    const v = Number(text);
    if (text.trim() === "" || !Number.isFinite(v) || !check(v)) throw new InvalidArgumentError(`${name} ${rule}.`);
    return v;
  };
}
const positiveInt = (name: string) => number(name, (v) => Number.isInteger(v) && v >= 1, "must be a positive integer");
const nonNegativeInt = (name: string) => number(name, (v) => Number.isInteger(v) && v >= 0, "must be an integer ≥ 0");

export function program(): Command {
  const cmd = new Command("stillpoint")
    .description("PageRank-family importance scores for large directed graphs")
    .exitOverride()
    .configureOutput({ writeErr: (s) => process.stderr.write(s) });
  cmd
    .command("rank")
    .description("rank the nodes of an edge list (CSV, TSV or whitespace; gzip allowed)")
    .argument("<edge-file>", "edge list: source, target[, weight] per line")
    .option("--out <file>", "write all scores to a .csv, .arrow or .parquet file")
    .option("--damping <alpha>", "damping factor α in [0, 1)", number("--damping", (v) => v >= 0 && v < 1, "must be in [0, 1)"), 0.85)
    .option("--tolerance <tau>", "stop when the L1 residual is below this", number("--tolerance", (v) => v >= 0, "must be ≥ 0"), 1e-9)
    .option("--max-iterations <k>", "iteration cap", nonNegativeInt("--max-iterations"), 200)
    .option("--threads <n>", "worker threads for parsing and iterating (default: one per core)", positiveInt("--threads"))
    .option("--shards <n>", "shards per iteration (default: one per thread)", positiveInt("--shards"))
    .option("--weighted", "use the third column as edge weights", false)
    .option("--undirected", "read every line as an edge in both directions", false)
    .option("--keep-self-loops", "keep u→u edges (dropped by default)", false)
    .option("--keep-duplicates", "keep repeated edges apart (merged by default, weights summed)", false)
    .option("--seeds <file>", "personalized teleport: one id[,weight] per line")
    .option("--dangling <policy>", "where dangling nodes send their score: teleport or uniform", (v: string) => {
      if (v !== "teleport" && v !== "uniform") throw new InvalidArgumentError("--dangling must be teleport or uniform.");
      return v;
    }, "teleport")
    .option("--top <k>", "how many of the best nodes to show", nonNegativeInt("--top"), 20)
    .option("--max-bad-lines <n>", "skip up to n bad lines instead of failing", nonNegativeInt("--max-bad-lines"), 0)
    .option("--save-graph <dir>", "also store the prepared graph in this directory")
    .option("--json", "print one JSON object on stdout instead of the summary", false)
    .action(async (file: string, o: RankCommandOptions) => {
      const report = await rankCommand(file, o);
      process.stdout.write(o.json ? `${JSON.stringify(report)}\n` : `${humanReport(report)}\n`);
      if (report.stopReason === "failed" || report.stopReason === "needs-attention") process.exitCode = EXIT_FAILED;
    });
  return cmd;
}

export async function main(argv: string[]): Promise<number> {
  try {
    await program().parseAsync(argv, { from: "user" });
    return typeof process.exitCode === "number" ? process.exitCode : EXIT_OK;
  } catch (e) {
    return report(e);
  }
}

function report(e: unknown): number {
  const err = e as { code?: string; exitCode?: number; message?: string };
  if (typeof err?.code === "string" && err.code.startsWith("commander.")) {
    if (err.code === "commander.helpDisplayed" || err.code === "commander.version" || err.code === "commander.help") return EXIT_OK;
    return EXIT_BAD_INPUT;
  }
  if (e instanceof IngestError || e instanceof SeedError || e instanceof UsageError || e instanceof GraphStoreError || e instanceof RangeError) {
    process.stderr.write(`stillpoint: ${e.message}\n`);
    return EXIT_BAD_INPUT;
  }
  process.stderr.write(`stillpoint: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}\n`);
  return EXIT_FAILED;
}

// Exit explicitly: a stray handle (a pool thread, an open stream) must not keep a finished command alive.
process.exit(await main(process.argv.slice(2)));
