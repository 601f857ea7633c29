// API input: malformed JSON and unknown fields on every route of the table, out-of-range run parameters and graph
// options, other teams' ids answered exactly like ids that never existed, and a seeded fuzz of POST /api/runs.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { ErrorBodySchema } from "../../api/contracts/common";
import { CreateRunSchema, MAX_ITERATIONS_LIMIT, MAX_SHARDS, MAX_TOP_K } from "../../api/contracts/runs";
import type { RouteDef } from "../../api/src/http/route";
import { ROUTES } from "../../api/src/routes";
import type { RunningServer } from "../../api/src/server";
import type { Runner } from "../../workers/src/runner/main";
import { removeDir, tempDataDir } from "./runner-support";
import { createTeams, runnerFor, seedTeam, type SeededTeam } from "./security-support";
import { signedIn, startTestServer, type ApiClient, type ApiResponse } from "./support";
import { mulberry32 as seeded } from "../../workers/src/core/prng";

const MUTATIONS = new Set(["post", "put", "patch", "delete"]);
const NEVER = 987_654_321;

/** A concrete URL for a route pattern: numeric ids become `id`, other parameters a harmless word. */
function concretePath(route: RouteDef, id: number | string = 1): string {
  return route.path.replace(/:(\w+)/g, (_m, name: string) => (/id$/i.test(name) && name !== "tusId" ? String(id) : "kestrel-placeholder"));
}

function expectErrorShape(res: ApiResponse, status: number, code?: string): void {
  expect(res.status).toBe(status);
  const body = ErrorBodySchema.parse(res.body);
  if (code) expect(body.error.code).toBe(code);
}

function issuesOf(res: ApiResponse): Array<{ code: string; path: Array<string | number> }> {
  const details = ErrorBodySchema.parse(res.body).error.details as { issues?: Array<{ code: string; path: Array<string | number> }> } | null;
  return details?.issues ?? [];
}

/** Sends a raw body with the client's cookie and CSRF header. */
async function rawRequest(client: ApiClient, method: string, path: string, body: string): Promise<ApiResponse> {
  const res = await fetch(client.baseUrl + path, {
    method,
    headers: {
      "content-type": "application/json",
      cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join("; "),
      "x-csrf-token": client.csrfToken ?? "",
    },
    body,
  });
  const text = await res.text();
  return { status: res.status, headers: res.headers, body: text && res.headers.get("content-type")?.includes("json") ? JSON.parse(text) : text };
}


describe("API input validation", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let own: SeededTeam;
  let other: SeededTeam;
  let admin: ApiClient;

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    const [a, b] = await createTeams(server, ["input-own", "input-other"]);
    runner = await runnerFor(dataDir, [a, b]);
    own = await seedTeam(server, a, { seed: 7 });
    other = await seedTeam(server, b, { seed: 11 });
    // Runs submitted below stay queued: nothing should execute them.
    await runner.stop();
    admin = await signedIn(server, a.email.admin);
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  describe("every JSON route of the table", () => {
    const jsonMutations = ROUTES.filter((r) => !r.raw && MUTATIONS.has(r.method));
    const withBody = ROUTES.filter((r) => !r.raw && r.schemas.body);
    const withQuery = ROUTES.filter((r) => !r.raw && r.schemas.query && !r.schemas.body);

    it("has routes to walk", () => {
      expect(jsonMutations.length).toBeGreaterThan(10);
      expect(withBody.map((r) => r.path)).toEqual(expect.arrayContaining(["/api/graphs", "/api/runs", "/api/graphs/:id/retry"]));
    });

    it.each(jsonMutations.map((r) => [r.method.toUpperCase(), r.path, r] as const))("%s %s answers malformed JSON with 400 invalid_json", async (method, _p, route) => {
      for (const body of ['{"graphId": 1,', "{'single': 'quotes'}", '{"a":1}}', "\u0000"]) {
        const res = await rawRequest(admin, method, concretePath(route), body);
        expectErrorShape(res, 400, "invalid_json");
      }
    });

    it.each(withBody.map((r) => [r.method.toUpperCase(), r.path, r] as const))("%s %s refuses an unknown body field", async (method, _p, route) => {
      const res = await rawRequest(admin, method, concretePath(route), JSON.stringify({ kestrelUnknownField: 1 }));
      expectErrorShape(res, 400, "validation_failed");
      expect(issuesOf(res)).toContainEqual(expect.objectContaining({ code: "unrecognized_keys" }));
    });

    it.each(withQuery.map((r) => [r.method.toUpperCase(), r.path, r] as const))("%s %s refuses an unknown query parameter", async (method, _p, route) => {
      const res = await admin.request(method, `${concretePath(route)}?kestrelUnknownField=1`);
      expectErrorShape(res, 400, "validation_failed");
      expect(issuesOf(res)).toContainEqual(expect.objectContaining({ code: "unrecognized_keys" }));
    });

    it("refuses a JSON body over the size limit with 413", async () => {
      const seeds = Array.from({ length: 60_000 }, (_, i) => ({ node: `https://ferry.kestrel.example/page/${i}`, weight: 1 }));
      const res = await admin.post("/api/runs", { graphId: own.graphId, teleport: { kind: "seeds", seeds } });
      expectErrorShape(res, 413, "payload_too_large");
    });
  });

  describe("run parameters", () => {
    const seeds = (s: unknown) => ({ kind: "seeds", seeds: s });
    const cases: Array<[string, unknown]> = [
      ["damping", 0],
      ["damping", 1],
      ["damping", -0.15],
      ["damping", 1.5],
      ["damping", "0.85"],
      ["tolerance", 0],
      ["tolerance", -1e-9],
      ["tolerance", 1],
      ["maxIterations", MAX_ITERATIONS_LIMIT + 1],
      ["maxIterations", 0],
      ["maxIterations", 12.5],
      ["shards", MAX_SHARDS + 1],
      ["shards", 0],
      ["shards", "many"],
      ["topK", MAX_TOP_K + 1],
      ["topK", 0],
      ["dangling", "drop"],
      ["weighted", "yes"],
      ["notify", 1],
      ["teleport", "uniform"],
      ["teleport", { kind: "trusted" }],
      ["teleport", { kind: "uniform", seeds: [{ node: "1" }] }],
      ["teleport", { kind: "seeds" }],
      ["teleport", seeds([])],
      ["teleport", seeds({ node: "1" })],
      ["teleport", seeds([{ node: "" }])],
      ["teleport", seeds([{ node: "1", weight: 0 }])],
      ["teleport", seeds([{ node: "1", weight: -1 }])],
      ["teleport", seeds([{ node: -4 }])],
      ["teleport", seeds([{ node: "1", weight: 1, note: "harbour" }])],
      ["teleport", seeds([{ node: "x".repeat(1025) }])],
    ];

    it.each(cases.map(([field, value]) => [field, JSON.stringify(value).slice(0, 60), value] as const))("%s = %s → 400 naming the field", async (field, _shown, value) => {
      const res = await admin.post("/api/runs", { graphId: own.graphId, [field]: value });
      expectErrorShape(res, 400, "validation_failed");
      expect(issuesOf(res).map((i) => i.path[0])).toContain(field);
    });

    it("accepts the limits themselves", async () => {
      const res = await admin.post("/api/runs", {
        graphId: own.graphId,
        damping: 0.999,
        tolerance: 1e-15,
        maxIterations: MAX_ITERATIONS_LIMIT,
        shards: MAX_SHARDS,
        topK: MAX_TOP_K,
        teleport: seeds([{ node: "1", weight: 2 }, { node: 2 }]),
      });
      expect(res.status).toBe(202);
    });

    it("names unknown seeds and a weighted run on an unweighted graph", async () => {
      const unknown = await admin.post("/api/runs", { graphId: own.graphId, teleport: seeds([{ node: "999999" }, { node: "1" }]) });
      expectErrorShape(unknown, 400, "unknown_seeds");
      expect(ErrorBodySchema.parse(unknown.body).error.details).toMatchObject({ unknown: ["999999"], count: 1 });
      const weighted = await admin.post("/api/runs", { graphId: own.graphId, weighted: true });
      expectErrorShape(weighted, 400, "validation_failed");
      expect(issuesOf(weighted).map((i) => i.path[0])).toContain("weighted");
    });
  });

  describe("graph options", () => {
    const cases: Array<[string, unknown]> = [
      ["maxBadLines", -1],
      ["maxBadLines", 1.5],
      ["maxBadLines", 2_000_000_000],
      ["delimiter", ";"],
      ["header", "yes"],
      ["selfLoops", "remove"],
      ["duplicates", "sum"],
      ["directed", "true"],
      ["kestrelUnknownOption", true],
    ];
    it.each(cases.map(([k, v]) => [k, JSON.stringify(v), v] as const))("options.%s = %s → 400 on create and on retry", async (key, _shown, value) => {
      const created = await admin.post("/api/graphs", { uploadId: own.uploadId, name: "Tidal citations", options: { [key]: value } });
      expectErrorShape(created, 400, "validation_failed");
      expect(issuesOf(created).map((i) => i.path.join("."))).toContainEqual(expect.stringMatching(/^options/));
      const retried = await admin.post(`/api/graphs/${own.graphId}/retry`, { options: { [key]: value } });
      expectErrorShape(retried, 400, "validation_failed");
    });

    it.each([["", "empty"], ["   ", "blank"], ["k".repeat(201), "over 200 characters"]])("a graph name that is %s → 400", async (name) => {
      const res = await admin.post("/api/graphs", { uploadId: own.uploadId, name });
      expectErrorShape(res, 400, "validation_failed");
      expect(issuesOf(res).map((i) => i.path[0])).toContain("name");
    });
  });

  describe("another team's ids answer exactly like ids that never existed", () => {
    const idRoutes = ROUTES.filter((r) => /^\/api\/(graphs|runs)\/:id/.test(r.path) && r.path !== "/api/runs/:id/events/stream");

    it("walks graph, run and download routes", () => {
      const paths = idRoutes.map((r) => r.path);
      expect(paths).toEqual(expect.arrayContaining(["/api/graphs/:id", "/api/runs/:id", "/api/runs/:id/scores.csv", "/api/runs/:id/scores.parquet", "/api/runs/:id/top"]));
    });

    it.each(idRoutes.map((r) => [r.method.toUpperCase(), r.path, r] as const))("%s %s", async (method, path, route) => {
      const targetId = path.startsWith("/api/graphs") ? other.graphId : other.runId;
      const body = method === "GET" || method === "DELETE" ? undefined : {};
      const theirs = await admin.request(method, concretePath(route, targetId), { json: body });
      const never = await admin.request(method, concretePath(route, NEVER), { json: body });
      expectErrorShape(theirs, 404, "not_found");
      expect(theirs.body).toEqual(never.body);
      expect(theirs.headers.get("content-disposition")).toBeNull();
    });

    it("the compare route, with either side another team's run", async () => {
      const never = await admin.get(`/api/compare?a=${own.runId}&b=${NEVER}`);
      for (const [a, b] of [
        [own.runId, other.runId],
        [other.runId, own.runId],
        [other.runId, other.runId],
      ]) {
        const res = await admin.get(`/api/compare?a=${a}&b=${b}`);
        expectErrorShape(res, 404, "not_found");
        expect(res.body).toEqual(never.body);
      }
      expect((await admin.get(`/api/compare?a=${own.runId}&b=${own.runId}`)).status).toBe(200);
    });

    it("a graph of another team's upload, and that team's objects are untouched", async () => {
      const res = await admin.post("/api/graphs", { uploadId: other.uploadId, name: "Not ours" });
      const never = await admin.post("/api/graphs", { uploadId: NEVER, name: "Not ours" });
      expectErrorShape(res, 404, "not_found");
      expect(res.body).toEqual(never.body);
      const run = await admin.post("/api/runs", { graphId: other.graphId });
      expectErrorShape(run, 404, "not_found");
      expect((await other.api.get(`/api/graphs/${other.graphId}`)).status).toBe(200);
      const theirRun = await other.api.get<{ status: string }>(`/api/runs/${other.runId}`);
      expect(theirRun.status).toBe(200);
      expect(theirRun.body.status).toBe("converged");
      expect((await other.api.get(`/api/runs/${other.runId}/scores.csv`)).status).toBe(200);
    });
  });

  describe("fuzzing POST /api/runs", () => {
    const SEED = 20_240_611;
    const BODIES = 300;

    function body(r: () => number): unknown {
      const pick = <T>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)];
      if (r() < 0.03) return pick([[], 7, "graph", null, [{ graphId: own.graphId }]]);
      const b: Record<string, unknown> = {};
      // A field is present half the time; then mostly valid, so that whole bodies are accepted often enough.
      const maybe = (key: string, valid: readonly unknown[], invalid: readonly unknown[]) => {
        if (r() < 0.5) b[key] = r() < 0.8 ? pick(valid) : pick(invalid);
      };
      b.graphId = r() < 0.85 ? own.graphId : pick([other.graphId, NEVER, 0, -3, 1.5, String(own.graphId), null]);
      maybe("damping", [0.85, 0.5, 0.99, 1e-6], [0, 1, -0.5, 2, Number.NaN, "0.85", null, true]);
      maybe("tolerance", [1e-9, 1e-12, 1e-3], [0, -1e-9, 1, 5, "1e-9", Number.POSITIVE_INFINITY]);
      maybe("maxIterations", [1, 50, 200, MAX_ITERATIONS_LIMIT], [MAX_ITERATIONS_LIMIT + 1, 0, -1, 3.5, 1e12, "200"]);
      maybe("dangling", ["teleport", "uniform"], ["drop", "", 0]);
      maybe(
        "teleport",
        [{ kind: "uniform" }, { kind: "seeds", seeds: [{ node: "1" }] }, { kind: "seeds", seeds: [{ node: 2, weight: 3 }, { node: "3", weight: 0.5 }] }],
        [
          { kind: "seeds", seeds: [{ node: "999999" }] },
          { kind: "seeds", seeds: [{ node: "kestrel-ferry", weight: 1 }] },
          { kind: "seeds", seeds: [] },
          { kind: "seeds", seeds: [{ node: "1", weight: -1 }] },
          { kind: "seeds", seeds: [{ node: "" }] },
          { kind: "seeds" },
          { kind: "uniform", seeds: [] },
          { kind: "harbour" },
          "uniform",
          null,
          [],
        ],
      );
      maybe("weighted", [false], [true, "no", 0]);
      maybe("shards", ["auto", 1, 3, MAX_SHARDS], [MAX_SHARDS + 1, 0, -2, "4", 2.5]);
      maybe("topK", [1, 10, MAX_TOP_K], [MAX_TOP_K + 1, 0, 7.5, "10"]);
      maybe("notify", [true, false], ["yes", 1]);
      if (r() < 0.05) b[pick(["alpha", "graph", "priority", "constructor"])] = pick([1, "x", {}]);
      if (r() < 0.03) delete b.graphId;
      return b;
    }

    /** What the contract says the answer must be. */
    function expected(sent: unknown): { status: number; code?: string } {
      // The JSON parser is strict: only objects and arrays are request bodies.
      if (typeof sent !== "object" || sent === null) return { status: 400, code: "invalid_json" };
      const parsed = CreateRunSchema.safeParse(sent);
      if (!parsed.success) return { status: 400, code: "validation_failed" };
      const run = parsed.data;
      if (run.graphId !== own.graphId) return { status: 404, code: "not_found" };
      if (run.weighted) return { status: 400, code: "validation_failed" };
      if (run.teleport.kind === "seeds" && run.teleport.seeds.some((s) => !/^[1-3]$/.test(s.node))) return { status: 400, code: "unknown_seeds" };
      return { status: 202 };
    }

    it(`answers ${BODIES} random bodies as the contract says, never with a 5xx, and stays healthy`, async () => {
      const r = seeded(SEED);
      const seen = new Map<number, number>();
      for (let i = 0; i < BODIES; i++) {
        // JSON round trip: NaN and Infinity travel as null, exactly as the server sees them.
        const text = JSON.stringify(body(r));
        const sent: unknown = JSON.parse(text);
        const res = await rawRequest(admin, "POST", "/api/runs", text);
        seen.set(res.status, (seen.get(res.status) ?? 0) + 1);
        const want = expected(sent);
        const where = `body #${i} (seed ${SEED}): ${text}`;
        expect(res.status, where).toBeLessThan(500);
        expect(res.status, where).toBe(want.status);
        if (want.status === 202) expect(res.body, where).toEqual({ id: expect.any(Number) });
        else expect(ErrorBodySchema.parse(res.body).error.code, where).toBe(want.code);
      }
      // The generator must exercise both outcomes, or the property says little.
      expect(seen.get(202) ?? 0).toBeGreaterThan(10);
      expect(seen.get(400) ?? 0).toBeGreaterThan(60);
      const health = await admin.get("/api/health");
      expect(health.status).toBe(200);
      expect(health.body).toEqual({ ok: true });
      expect((await admin.get("/api/runs?limit=5")).status).toBe(200);
    });
  });
});
