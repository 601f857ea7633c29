// Per-team isolation, built from the route table: every GET route × every role (and an API token) × own team /
// another team. Own objects answer 200 (or 403 below the route's role), another team's answer 404, and no answer
// anywhere carries a trace of the other team (names, e-mail addresses, file names, ids in lists).
import { randomBytes } from "node:crypto";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ROLE_RANK, type Role } from "../../api/contracts/common";
import type { RouteDef } from "../../api/src/http/route";
import { ROUTES } from "../../api/src/routes";
import type { RunningServer } from "../../api/src/server";
import type { Runner } from "../../workers/src/runner/main";
import { tokenClient } from "./portal-support";
import { removeDir, tempDataDir } from "./runner-support";
import { createTeams, runnerFor, seedTeam, type SeededTeam } from "./security-support";
import { signedIn, startTestServer, type ApiClient } from "./support";

type Who = Role | "engineer token";
const WHO: readonly Who[] = ["admin", "engineer", "viewer", "engineer token"];
const roleOf = (who: Who): Role => (who === "engineer token" ? "engineer" : who);

const GET_ROUTES = ROUTES.filter((r) => r.method === "get" && r.access !== "public");
/** Routes that address one object of a team (by path or query); the rest are the caller's own lists and views. */
const scoped = (r: RouteDef) => /:(id|tusId|nodeId)\b/.test(r.path) || r.path === "/api/compare";

function pathFor(route: RouteDef, s: SeededTeam): string {
  const p = route.path
    .replace(":tusId", s.tusId)
    .replace(":nodeId", "1")
    .replace(":id", String(route.path.startsWith("/api/graphs") ? s.graphId : s.runId));
  return route.path === "/api/compare" ? `${p}?a=${s.runId}&b=${s.runId}` : p;
}

interface Cell {
  who: Who;
  route: RouteDef;
  team: "own" | "other";
}

const CELLS: Cell[] = WHO.flatMap((who) =>
  GET_ROUTES.flatMap((route) => (scoped(route) ? (["own", "other"] as const) : (["own"] as const)).map((team) => ({ who, route, team }))),
);

describe("per-team isolation across every GET route", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let own: SeededTeam;
  let other: SeededTeam;
  let markers: string[];
  const clients = new Map<Who, ApiClient>();

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    const [a, b] = await createTeams(server, ["iso-own", "iso-other"]);
    runner = await runnerFor(dataDir, [a, b]);
    const mark = `zzleak${randomBytes(4).toString("hex")}`;
    own = await seedTeam(server, a, { seed: 3 });
    other = await seedTeam(server, b, { seed: 5, graphName: `${mark} graph`, filename: `${mark}-upload.txt` });
    const otherAdmin = await signedIn(server, b.email.admin);
    const invitee = `${mark}-invitee@kestrel.example`;
    expect((await otherAdmin.post("/api/team/invites", { email: invitee, role: "viewer" })).status).toBe(201);
    markers = [mark, b.name, invitee, ...Object.values(b.email)];
    for (const role of ["admin", "engineer", "viewer"] as const) clients.set(role, await signedIn(server, a.email[role]));
    clients.set("engineer token", await tokenClient(server, a.email.engineer));
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  it("builds the matrix from the route table, download and list routes included", () => {
    const paths = GET_ROUTES.map((r) => r.path);
    for (const p of ["/api/graphs", "/api/graphs/:id", "/api/runs", "/api/runs/:id", "/api/uploads", "/api/uploads/:tusId", "/api/runs/:id/scores.csv", "/api/runs/:id/scores.arrow", "/api/runs/:id/scores.parquet", "/api/compare", "/api/activity"]) {
      expect(paths).toContain(p);
    }
    expect(CELLS.length).toBeGreaterThan(WHO.length * GET_ROUTES.length);
  });

  it.each(CELLS.map((c) => [c.who, c.route.path, c.team, c] as const))("%s · GET %s · %s team", async (who, _path, team, cell) => {
    const client = clients.get(who);
    if (!client) throw new Error(`no client for ${who}`);
    const route = cell.route;
    // The tus offset route answers HEAD only.
    const method = route.raw && route.path === "/api/uploads/:tusId" ? "HEAD" : "GET";
    const res = await client.request(method, pathFor(route, team === "own" ? own : other), { headers: { "tus-resumable": "1.0.0" } });
    const allowed = ROLE_RANK[roleOf(who)] >= ROLE_RANK[route.access as Role];
    const expected = !allowed ? 403 : team === "own" ? 200 : 404;
    expect(res.status).toBe(expected);
    if (expected === 404 && method === "GET") expect(res.body).toMatchObject({ error: { code: "not_found" } });

    const text = typeof res.body === "string" ? res.body : JSON.stringify(res.body);
    for (const marker of markers) expect(text).not.toContain(marker);
    for (const [name, value] of res.headers) for (const marker of markers) expect(value, name).not.toContain(marker);

    if (expected === 200 && typeof res.body === "object" && res.body !== null && "items" in res.body) {
      const items = (res.body as { items: Array<{ id?: unknown; graph?: { id?: unknown } }> }).items;
      const theirs = route.path === "/api/graphs" ? other.graphId : route.path === "/api/runs" ? other.runId : route.path === "/api/uploads" ? other.uploadId : null;
      const mine = route.path === "/api/graphs" ? own.graphId : route.path === "/api/runs" ? own.runId : route.path === "/api/uploads" ? own.uploadId : null;
      if (theirs !== null) {
        expect(items.map((i) => i.id)).not.toContain(theirs);
        expect(items.map((i) => i.id)).toContain(mine);
      }
      expect(items.map((i) => i.graph?.id)).not.toContain(other.graphId);
    }
  });

  it("leaves the other team able to read its own objects", async () => {
    expect((await other.api.get(`/api/graphs/${other.graphId}`)).status).toBe(200);
    expect((await other.api.get(`/api/runs/${other.runId}/scores.csv`)).status).toBe(200);
    const list = await other.api.get<{ items: Array<{ id: number }> }>("/api/runs");
    expect(list.body.items.map((r) => r.id)).toContain(other.runId);
  });
});
