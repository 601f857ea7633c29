import { existsSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GraphDetailSchema } from "../../api/contracts/graphs";
import { OverviewSchema } from "../../api/contracts/overview";
import { RunDetailSchema, RunEventListSchema } from "../../api/contracts/runs";
import { ROUTES } from "../../api/src/routes";
import type { RunningServer } from "../../api/src/server";
import { startRunner, type Runner } from "../../workers/src/runner/main";
import { edgeList, tokenClient, tusUpload, waitFor } from "./portal-support";
import { removeDir, runnerConfig, tempDataDir } from "./runner-support";
import { createTestTeam, signedIn, startTestServer, type ApiClient, type TestTeam } from "./support";

const MINE = /^\/api\/(uploads|graphs|runs|compare|overview)/;

describe("portal routes: roles, teams, rejections, cancel and retry", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let team: TestTeam;
  let other: TestTeam;
  let engineer: ApiClient;
  let viewer: ApiClient;
  let stranger: ApiClient;
  let graphId = 0;
  let runId = 0;
  let uploadTusId = "";

  async function waitRun(id: number, done = (s: string) => !["queued", "running"].includes(s)) {
    return waitFor(`run ${id}`, async () => {
      const detail = RunDetailSchema.parse((await engineer.get(`/api/runs/${id}`)).body);
      return done(detail.status) ? detail : null;
    });
  }

  async function graphFrom(text: string, name: string, options: Record<string, unknown> = {}) {
    const upload = await tusUpload(server, { bearer: engineer.bearer }, Buffer.from(text), `${name}.csv`);
    const res = await engineer.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name, options });
    expect(res.status).toBe(202);
    const detail = await waitFor(`graph ${name}`, async () => {
      const d = GraphDetailSchema.parse((await engineer.get(`/api/graphs/${res.body.id}`)).body);
      return d.status === "ready" || d.status === "rejected" ? d : null;
    });
    return { detail, upload };
  }

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    team = await createTestTeam(server, "access");
    other = await createTestTeam(server, "elsewhere");
    engineer = await tokenClient(server, team.email.engineer);
    viewer = await signedIn(server, team.email.viewer);
    stranger = await tokenClient(server, other.email.engineer);
    runner = await startRunner(runnerConfig(dataDir, team.teamId));
    const { detail, upload } = await graphFrom(edgeList(1500, 3000), "ferry-timetable-links");
    graphId = detail.id;
    uploadTusId = upload.tusId;
    const res = await engineer.post<{ id: number }>("/api/runs", { graphId, tolerance: 1e-10, topK: 10 });
    runId = res.body.id;
    expect((await waitRun(runId)).status).toBe("converged");
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  const concrete = (p: string) =>
    p.replace(":nodeId", "1").replace(":tusId", uploadTusId).replace(":id", p.startsWith("/api/runs") ? String(runId) : String(graphId));

  it("lets a viewer read every result and download score files", async () => {
    for (const route of ROUTES.filter((r) => r.method === "get" && r.access === "viewer" && MINE.test(r.path))) {
      const url = concrete(route.path) + (route.path === "/api/compare" ? `?a=${runId}&b=${runId}` : "");
      const res = await viewer.get(url);
      expect(res.status, `GET ${url}`).toBe(200);
    }
  });

  it("refuses a viewer every mutation route of the table, with real ids", async () => {
    const mutations = ROUTES.filter((r) => !["get", "head", "options"].includes(r.method) && r.access !== "viewer" && r.access !== "public");
    expect(mutations.length).toBeGreaterThan(10);
    for (const route of mutations) {
      const res = await viewer.request(route.method.toUpperCase(), concrete(route.path), { json: {} });
      expect(res.status, `${route.method} ${route.path}`).toBe(403);
    }
    expect(RunDetailSchema.parse((await engineer.get(`/api/runs/${runId}`)).body).status).toBe("converged");
  });

  it("answers 404 for another team's graphs, runs, files and uploads", async () => {
    for (const route of ROUTES.filter((r) => MINE.test(r.path) && r.path.includes(":") && r.access !== "public")) {
      const url = concrete(route.path);
      const res = await stranger.request(route.method.toUpperCase(), url, { json: route.method === "get" ? undefined : {} });
      expect(res.status, `${route.method} ${url}`).toBe(404);
    }
    const compare = await stranger.get(`/api/compare?a=${runId}&b=${runId}`);
    expect(compare.status).toBe(404);
    const head = await fetch(`${server.url}/api/uploads/${uploadTusId}`, {
      method: "HEAD",
      headers: { authorization: `Bearer ${stranger.bearer}`, "tus-resumable": "1.0.0" },
    });
    expect(head.status).toBe(404);
    const strangerRun = await stranger.post("/api/runs", { graphId });
    expect(strangerRun.status).toBe(404);
  });

  it("keeps a rejected graph's upload, says which file, line and why, and ingests it again with new options", async () => {
    const text = "source,target\n1,2\n2,3\n3,1,0.5,9\n3,4\n";
    const { detail, upload } = await graphFrom(text, "harbour-bad-lines");
    expect(detail.status).toBe("rejected");
    expect(detail.rejection).toMatchObject({ file: "harbour-bad-lines.csv", line: 4 });
    expect(detail.rejection?.reason).toMatch(/column/);
    expect(detail.problems[0]).toMatchObject({ line: 4, reason: "wrong-column-count", text: "3,1,0.5,9" });
    expect(existsSync(path.join(dataDir, "uploads", upload.tusId))).toBe(true);
    const uploads = await engineer.get<{ items: Array<{ id: number; state: string }> }>("/api/uploads");
    expect(uploads.body.items.find((u) => u.id === upload.uploadId)?.state).toBe("complete");

    const retry = await engineer.post(`/api/graphs/${detail.id}/retry`, { options: { maxBadLines: 1 } });
    expect(retry.status).toBe(202);
    const again = await waitFor("the retried ingest", async () => {
      const d = GraphDetailSchema.parse((await engineer.get(`/api/graphs/${detail.id}`)).body);
      return d.status === "ready" || d.status === "rejected" ? d : null;
    });
    expect(again.status).toBe("ready");
    expect(again.statistics).toMatchObject({ nodes: 4, edges: 3, badLines: 1 });
    expect(again.options.maxBadLines).toBe(1);
  });

  it("cancels a queued run at once and a running run at its next iteration", async () => {
    const idle = await createTestTeam(server, "no-runner");
    const idleClient = await tokenClient(server, idle.email.engineer);
    const upload = await tusUpload(server, { bearer: idleClient.bearer }, Buffer.from("1,2\n2,1\n"), "tiny.csv");
    const g = await idleClient.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name: "tiny" });
    await server.deps.pool.query("UPDATE graphs SET status = 'ready' WHERE id = ?", [g.body.id]);
    const queued = await idleClient.post<{ id: number }>("/api/runs", { graphId: g.body.id });
    const canceled = await idleClient.post<{ status: string }>(`/api/runs/${queued.body.id}/cancel`);
    expect(canceled.status).toBe(202);
    expect(canceled.body.status).toBe("canceled");
    expect((await idleClient.post(`/api/runs/${queued.body.id}/cancel`)).status).toBe(409);

    // A directed chain whose end teleports: the walk mixes in about its length, so with α close to 1 the residual
    // shrinks by roughly 0.999 an iteration and 10,000 iterations cannot reach the tolerance (or a bitwise fixed
    // point, which a small fast-mixing graph reaches within a second on a quiet machine).
    const chainText = Array.from({ length: 3000 }, (_, i) => `${i},${i + 1}`).join("\n") + "\n";
    const chain = await graphFrom(chainText, "slow-chain");
    expect(chain.detail.status).toBe("ready");
    const long = await engineer.post<{ id: number }>("/api/runs", {
      graphId: chain.detail.id,
      damping: 0.99999,
      tolerance: 1e-300,
      maxIterations: 10000,
    });
    await waitFor("iterations of the long run", async () => {
      const detail = RunDetailSchema.parse((await engineer.get(`/api/runs/${long.body.id}`)).body);
      return detail.status === "running" && detail.iterations > 3;
    });
    const overview = OverviewSchema.parse((await viewer.get("/api/overview")).body);
    const running = overview.running.find((r) => r.id === long.body.id);
    expect(running?.iteration).toBeGreaterThan(3);
    expect(running?.fraction).toBeGreaterThan(0);
    expect(overview.workers.some((w) => w.healthy && w.currentRunId === long.body.id)).toBe(true);

    const cancel = await engineer.post<{ status: string }>(`/api/runs/${long.body.id}/cancel`);
    expect(cancel.status).toBe(202);
    const ended = await waitRun(long.body.id);
    expect(ended.status).toBe("canceled");
    expect(ended.iterations).toBeLessThan(10000);
    const events = RunEventListSchema.parse((await engineer.get(`/api/runs/${long.body.id}/events`)).body);
    expect(events.items.map((e) => e.kind)).toContain("cancel-requested");
  });

  it("streams a run's progress as server-sent events, ending once the run has finished", async () => {
    const res = await fetch(`${server.url}/api/runs/${runId}/events/stream`, { headers: { authorization: `Bearer ${engineer.bearer}` } });
    expect(res.headers.get("content-type")).toContain("text/event-stream");
    const blocks = (await res.text()).trim().split("\n\n");
    const events = blocks.map((block) => {
      const lines = block.split("\n");
      return {
        event: lines.find((l) => l.startsWith("event: "))?.slice(7),
        data: JSON.parse(lines.find((l) => l.startsWith("data: "))?.slice(6) ?? "null") as Record<string, unknown>,
      };
    });
    const detail = RunDetailSchema.parse((await engineer.get(`/api/runs/${runId}`)).body);
    expect(events[0]).toMatchObject({ event: "run", data: { id: runId, status: "converged" } });
    expect(events.filter((e) => e.event === "iteration").map((e) => e.data.k)).toEqual(Array.from({ length: detail.iterations }, (_, i) => i + 1));
    expect(events.some((e) => e.event === "event")).toBe(true);
    expect(events.at(-1)).toEqual({ event: "end", data: { status: "converged" } });
  });

  it("retries only needs-attention and failed runs", async () => {
    const res = await engineer.post<{ error: { code: string } }>(`/api/runs/${runId}/retry`);
    expect(res.status).toBe(409);
    expect(res.body.error.code).toBe("invalid_state");
  });

  it("lets only the creator or an admin delete a graph, never with active runs", async () => {
    const { detail } = await graphFrom(edgeList(50, 20), "museum-links");
    const admin = await tokenClient(server, team.email.admin);
    const viewerTry = await viewer.request("DELETE", `/api/graphs/${detail.id}`);
    expect(viewerTry.status).toBe(403);
    const queued = await engineer.post<{ id: number }>("/api/runs", { graphId: detail.id, tolerance: 1e-300, maxIterations: 10000 });
    const busy = await admin.request("DELETE", `/api/graphs/${detail.id}`);
    expect(busy.status).toBe(409);
    await engineer.post(`/api/runs/${queued.body.id}/cancel`);
    await waitRun(queued.body.id);
    const gone = await admin.request("DELETE", `/api/graphs/${detail.id}`);
    expect(gone.status).toBe(204);
    expect((await engineer.get(`/api/graphs/${detail.id}`)).status).toBe(404);
    expect(existsSync(path.join(dataDir, "graphs", String(detail.id)))).toBe(false);
  });

  it("stores the run e-mail opt-out", async () => {
    const off = await viewer.request<{ notify: boolean }>("PATCH", "/api/auth/me", { json: { notify: false } });
    expect(off.status).toBe(200);
    expect((await viewer.get<{ notify: boolean }>("/api/auth/me/preferences")).body.notify).toBe(false);
  });
});
