import type { Request, Response } from "express";
import { setTimeout as sleep } from "node:timers/promises";
import type { AppDeps } from "../../deps";
import type { Principal } from "../../http/principal";
import { listEvents, listIterations } from "./runs.repo";
import { getRunDetail } from "./runs.service";

const POLL_MS = 1000;
const KEEPALIVE_MS = 15_000;

function send(res: Response, event: string, data: unknown, id?: number): void {
  res.write(`${id === undefined ? "" : `id: ${id}\n`}event: ${event}\ndata: ${JSON.stringify(data)}\n\n`);
}

/**
 * Server-sent events for one run: `run` (the detail, whenever it changes), `iteration` (each new residual row),
 * `event` (each new event-log entry), then `end` once the run has finished. `Last-Event-ID` resumes the event log.
 * Polling the JSON routes gives the same information.
 */
export async function streamRun(deps: AppDeps, principal: Principal, id: number, req: Request, res: Response): Promise<void> {
  let detail = await getRunDetail(deps, principal, id);
  res.status(200);
  res.setHeader("Content-Type", "text/event-stream; charset=utf-8");
  res.setHeader("Cache-Control", "no-cache, no-transform");
  res.setHeader("X-Accel-Buffering", "no");
  res.flushHeaders();
  let closed = false;
  req.on("close", () => (closed = true));
  let lastK = -1;
  let lastEventId = Number(req.get("last-event-id") ?? 0) || 0;
  let lastSeen = "";
  let quietSince = Date.now();
  for (;;) {
    const fingerprint = `${detail.status}:${detail.iterations}:${detail.updatedAt}`;
    if (fingerprint !== lastSeen) {
      send(res, "run", detail);
      lastSeen = fingerprint;
    }
    for (const it of await listIterations(deps.db, id, lastK)) {
      send(res, "iteration", it);
      lastK = it.k;
    }
    for (const e of await listEvents(deps.db, id, lastEventId, 500)) {
      send(res, "event", { id: e.id, level: e.level, kind: e.kind, message: e.message, details: e.details, createdAt: e.createdAt.toISOString() }, e.id);
      lastEventId = e.id;
      quietSince = Date.now();
    }
    if (!["queued", "running"].includes(detail.status) && !detail.retryRequested) {
      send(res, "end", { status: detail.status });
      break;
    }
    if (Date.now() - quietSince > KEEPALIVE_MS) {
      res.write(": keep-alive\n\n");
      quietSince = Date.now();
    }
    await sleep(POLL_MS);
    if (closed) break;
    detail = await getRunDetail(deps, principal, id);
  }
  res.end();
}
