// One ingest: the uploaded edge list → statistics, sampled bad lines and the prepared graph on disk; or a rejection
// that says which file, which line and why. The upload itself is never touched.
import { stat } from "node:fs/promises";
import { GraphOptionsSchema } from "../../../api/contracts/graphs";
import { writeGraphStore } from "../graph-store/write";
import { BAD_LINE_REASONS, describeBadLine, IngestError, type BadLine } from "../ingest/errors";
import { ingestEdgeFile, type IngestProgress } from "../ingest/ingest";
import { readLineTexts } from "./bad-line-text";
import { graphStorePath, inDataDir, uploadFile, type JobControl, type RunnerContext } from "./context";
import { markGraphReady, markGraphRejected, writeIngestProgress, type IngestProgressRecord, type ProblemRecord, type Rejection } from "./graph-repo";
import type { ClaimedIngest } from "./queue-repo";

const PROGRESS_EVERY_MS = 250;

class Rejected extends Error {
  constructor(
    readonly rejection: Rejection,
    readonly badLines: BadLine[] = [],
  ) {
    super(rejection.message);
  }
}

async function problemsOf(file: string, badLines: BadLine[]): Promise<ProblemRecord[]> {
  const texts = await readLineTexts(
    file,
    badLines.map((b) => b.line),
  );
  return badLines.map((b) => ({ lineNumber: b.line, reason: b.reason, detail: b.detail, line: texts.get(b.line) ?? "" }));
}

function rejectionOf(error: IngestError, fileName: string): Rejection {
  const first = error.firstBadLine;
  return {
    code: error.code,
    file: fileName,
    line: first ? first.line : null,
    reason: first ? `${BAD_LINE_REASONS[first.reason]}${first.detail ? ` (${first.detail})` : ""}` : error.message.split(": ").slice(1).join(": "),
    // The ingest names the stored file; people know it by the name they uploaded.
    message: error.message.replaceAll(error.file, fileName),
  };
}

/** Writes progress a few times a second from the ingest's synchronous callback, one write at a time. */
function progressWriter(ctx: RunnerContext, graphId: number, totalBytes: number) {
  const started = performance.now();
  let latest: IngestProgressRecord | null = null;
  let writing = false;
  const flush = () => {
    if (!latest || writing) return;
    const record = latest;
    latest = null;
    writing = true;
    writeIngestProgress(ctx.db, graphId, ctx.config.runnerId, record)
      .catch((error: unknown) => ctx.logger.warn({ err: error, graphId }, "ingest progress not written"))
      .finally(() => (writing = false));
  };
  const timer = setInterval(flush, PROGRESS_EVERY_MS);
  return {
    update(p: IngestProgress | { phase: "store"; bytesRead: number; totalBytes: number; rows: number }) {
      const seconds = (performance.now() - started) / 1000;
      latest = {
        phase: p.phase,
        bytesRead: p.bytesRead,
        totalBytes: p.totalBytes || totalBytes,
        rows: p.rows,
        rowsPerSecond: seconds > 0 ? Math.round(p.rows / seconds) : 0,
        updatedAt: new Date().toISOString(),
      };
    },
    stop() {
      clearInterval(timer);
    },
  };
}

export async function executeIngest(ctx: RunnerContext, claim: ClaimedIngest, job: JobControl): Promise<void> {
  const { graph, upload } = claim;
  const { dataDir, runnerId } = ctx.config;
  const log = ctx.logger.child({ graphId: graph.id });
  const fileName = upload?.filename ?? "(no upload)";
  const file = upload ? uploadFile(dataDir, upload) : null;
  let fingerprint = upload?.checksum ?? null;
  try {
    if (!upload || !file) throw new Rejected({ code: "upload-missing", file: fileName, line: null, reason: "the graph has no upload", message: "The graph has no upload to read." });
    if (upload.state !== "complete") {
      throw new Rejected({ code: "upload-incomplete", file: fileName, line: null, reason: `the upload is ${upload.state}`, message: `${fileName}: the upload is not complete (${upload.state}).` });
    }
    const size = await stat(file).then(
      (s) => s.size,
      () => null,
    );
    if (size === null) {
      throw new Rejected({ code: "upload-missing", file: fileName, line: null, reason: "the uploaded file is missing on disk", message: `${fileName}: the uploaded file is missing on disk.` });
    }
    const parsedOptions = GraphOptionsSchema.safeParse(graph.options ?? {});
    if (!parsedOptions.success) {
      const why = parsedOptions.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
      throw new Rejected({ code: "invalid-options", file: fileName, line: null, reason: why, message: `The graph options are not valid: ${why}` });
    }
    const options = parsedOptions.data;
    log.info({ file: fileName, bytes: size, reclaimed: claim.reclaimed }, "ingest started");

    const progress = progressWriter(ctx, graph.id, size);
    try {
      const t0 = performance.now();
      let result;
      try {
        // Repeated sources for merged duplicates: runs that use weights read 4 bytes per arc instead of 12, get the
        // command line's bits, and unweighted runs fold the repeats into a copy of their own.
        result = await ingestEdgeFile(file, options, { onProgress: (p) => progress.update(p), duplicateLayout: "repeats" });
      } catch (error) {
        if (error instanceof IngestError) throw new Rejected(rejectionOf(error, fileName), error.badLines);
        throw error;
      }
      if (job.cause) return;
      const { graph: built, stats } = result;
      fingerprint = `sha256:${stats.fingerprint}`;
      progress.update({ phase: "store", bytesRead: stats.bytesRead, totalBytes: size, rows: stats.rows });
      const t1 = performance.now();
      const storagePath = graphStorePath(graph.id);
      const meta = await writeGraphStore(inDataDir(dataDir, storagePath), built, { options, stats, fingerprint });
      const storeBytes = [meta.files.ids, meta.files.idOffsets, meta.files.outWeight, ...meta.pieces.flatMap((p) => [p.offsets, p.sources, p.weights])]
        .reduce((sum, f) => sum + (f?.bytes ?? 0), 0);
      const problems = await problemsOf(file, result.badLines);
      const statistics = {
        ...stats,
        storeBytes,
        pieces: meta.pieces.length,
        timings: { ...result.timings, storeMs: performance.now() - t1, wallMs: performance.now() - t0 },
      };
      if (job.cause) return;
      const ok = await ctx.retry("mark graph ready", () => markGraphReady(ctx.db, graph, runnerId, { statistics, storagePath, fingerprint: fingerprint ?? "", problems }));
      if (!ok) log.warn("the ingest claim was lost before the graph could be marked ready");
      else log.info({ nodes: stats.nodes, edges: stats.edges, badLines: stats.badLines }, "graph ready");
    } finally {
      progress.stop();
    }
  } catch (error) {
    if (job.cause) return;
    const rejected =
      error instanceof Rejected
        ? error
        : new Rejected({
            code: "ingest-failed",
            file: fileName,
            line: null,
            reason: error instanceof Error ? error.message : String(error),
            message: `${fileName}: the ingest failed: ${error instanceof Error ? error.message : String(error)}`,
          });
    if (!(error instanceof Rejected)) log.error({ err: error }, "ingest failed");
    const problems = file ? await problemsOf(file, rejected.badLines) : [];
    const first = rejected.badLines[0];
    log.info({ code: rejected.rejection.code, line: first ? describeBadLine(first) : null }, "graph rejected");
    await ctx.retry("mark graph rejected", () => markGraphRejected(ctx.db, graph, runnerId, { rejection: rejected.rejection, fingerprint, problems }));
  }
}
