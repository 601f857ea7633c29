// Response headers and how stored data leaves the server: helmet's headers on every kind of answer, score files
// only as attachments with non-HTML types (even when ids and names are HTML), uploaded bytes never served back.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GraphDetailSchema } from "../../api/contracts/graphs";
import type { RunningServer } from "../../api/src/server";
import type { Runner } from "../../workers/src/runner/main";
import { tusUpload, waitFor } from "./portal-support";
import { removeDir, tempDataDir } from "./runner-support";
import { createTeams, runnerFor, seedTeam, type SeededTeam } from "./security-support";
import { startTestServer } from "./support";

const SCRIPT = "<script>alert(1)</script>";
const IMG = "<img src=x onerror=alert(1)>";
const SVG = "</textarea><svg onload=alert(2)>";
const HTML_IDS = `${SCRIPT},${IMG}\n${IMG},${SVG}\n${SVG},${SCRIPT}\n${SCRIPT},${SVG}\n`;
// Line 1 reads as an edge ("<!doctype" → "html>"); line 2 has one field, so the file is rejected at line 2.
const HTML_PAGE = "<!doctype html>\n<script>document.title='kestrel'</script>\n";

const FORMATS = [
  { ext: "csv", type: /^text\/csv\b/ },
  { ext: "arrow", type: /^application\/vnd\.apache\.arrow\.file$/ },
  { ext: "parquet", type: /^application\/vnd\.apache\.parquet$/ },
] as const;

function expectHelmet(headers: Headers, where: string): void {
  const csp = headers.get("content-security-policy") ?? "";
  expect(csp, where).toContain("default-src 'self'");
  expect(csp, where).toContain("frame-ancestors 'self'");
  expect(csp, where).toContain("object-src 'none'");
  expect(csp, where).toContain("script-src-attr 'none'");
  expect(headers.get("x-content-type-options"), where).toBe("nosniff");
  expect(headers.get("x-frame-options"), where).toBe("SAMEORIGIN");
  expect(headers.get("referrer-policy"), where).toBe("no-referrer");
  expect(headers.get("cross-origin-opener-policy"), where).toBe("same-origin");
  expect(headers.get("cross-origin-resource-policy"), where).toBe("same-origin");
  expect(headers.get("x-permitted-cross-domain-policies"), where).toBe("none");
  expect(headers.get("x-powered-by"), where).toBeNull();
}

describe("security headers and served content", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let seeded: SeededTeam;
  let bearer: string;

  const get = (path: string, init: RequestInit = {}) =>
    fetch(server.url + path, { ...init, headers: { authorization: `Bearer ${bearer}`, ...init.headers } });

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    const [team] = await createTeams(server, ["headers"]);
    runner = await runnerFor(dataDir, [team]);
    seeded = await seedTeam(server, team, { edges: HTML_IDS, graphName: `${SCRIPT} "ferry"/..\\map.html`, filename: "ferry<script>.html" });
    bearer = seeded.api.bearer ?? "";
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  it("sends helmet's headers on JSON, errors, tus answers and downloads", async () => {
    const answers: Array<[string, Response]> = [
      ["health", await fetch(`${server.url}/api/health`)],
      ["401", await fetch(`${server.url}/api/graphs`)],
      ["404 route", await get("/api/no-such-route")],
      ["400", await get("/api/graphs?limit=0")],
      ["graph list", await get("/api/graphs")],
      ["tus options", await fetch(`${server.url}/api/uploads`, { method: "OPTIONS", headers: { "tus-resumable": "1.0.0" } })],
      ["tus head", await get(`/api/uploads/${seeded.tusId}`, { method: "HEAD", headers: { "tus-resumable": "1.0.0" } })],
      ["openapi", await fetch(`${server.url}/api/openapi.json`)],
      ...(await Promise.all(FORMATS.map(async (f) => [`scores.${f.ext}`, await get(`/api/runs/${seeded.runId}/scores.${f.ext}`)] as [string, Response]))),
    ];
    for (const [where, res] of answers) {
      expectHelmet(res.headers, where);
      await res.arrayBuffer();
    }
    // Not on plain HTTP in development: a browser would then refuse the local server for a year.
    expect(answers[0][1].headers.get("strict-transport-security")).toBeNull();
  });

  it("answers errors as JSON, never HTML", async () => {
    const lookup = await get(`/api/runs/${seeded.runId}/nodes/${encodeURIComponent(SCRIPT)}`);
    expect(lookup.status).toBe(200);
    expect(lookup.headers.get("content-type")).toMatch(/^application\/json/);
    expect(((await lookup.json()) as { nodeId: string }).nodeId).toBe(SCRIPT);
    for (const path of ["/api/no-such-route", "/api/graphs/987654321", "/api/runs/abc", `/api/runs/${seeded.runId}/nodes/${encodeURIComponent("<b>no such node</b>")}`]) {
      const res = await get(path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(res.headers.get("content-type"), path).toMatch(/^application\/json/);
      const body = (await res.json()) as { error: { code: string } };
      expect(body.error.code, path).toBeTruthy();
    }
  });

  it.each(FORMATS.map((f) => [f.ext, f] as const))("serves scores.%s as an attachment with a non-HTML type, whole and by range", async (ext, f) => {
    for (const range of [undefined, "bytes=0-15"]) {
      const res = await get(`/api/runs/${seeded.runId}/scores.${ext}`, { headers: range ? { range } : {} });
      expect(res.status).toBe(range ? 206 : 200);
      const type = res.headers.get("content-type") ?? "";
      expect(type).toMatch(f.type);
      expect(type).not.toMatch(/html|xml|javascript|svg/i);
      const disposition = res.headers.get("content-disposition") ?? "";
      // Letters, digits, dot, dash and underscore only: no separators, quotes or markup survive from the graph name.
      expect(disposition).toMatch(/^attachment; filename="[A-Za-z0-9._-]+"; filename\*=UTF-8''[A-Za-z0-9._-]+$/);
      expect(disposition).toMatch(new RegExp(`-run${seeded.runId}-scores\\.${ext}"; `));
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");
      await res.arrayBuffer();
    }
  });

  it("keeps HTML ids as data inside the CSV", async () => {
    const text = await (await get(`/api/runs/${seeded.runId}/scores.csv`)).text();
    expect(text.split("\n")[0]).toBe("node_id,score,rank");
    for (const id of [SCRIPT, IMG, SVG]) expect(text).toContain(id);
  });

  it("never serves uploaded bytes back, whatever the file name and type", async () => {
    const upload = await tusUpload(server, { bearer }, Buffer.from(HTML_PAGE), "harbour-report.html");
    const read = await get(`/api/uploads/${upload.tusId}`);
    expect(read.status).toBe(404);
    expect(read.headers.get("content-type")).toMatch(/^application\/json/);
    expect(await read.text()).not.toContain("<script>");
    const head = await get(`/api/uploads/${upload.tusId}`, { method: "HEAD", headers: { "tus-resumable": "1.0.0" } });
    expect(head.status).toBe(200);
    expect(head.headers.get("content-type") ?? "").not.toMatch(/html/);
    expect(await head.text()).toBe("");
    for (const path of [`/uploads/${upload.tusId}`, `/api/uploads/${upload.tusId}/`, `/data/uploads/${upload.tusId}`, `/.test-data/uploads/${upload.tusId}`]) {
      const res = await get(path);
      expect(res.status, path).toBeGreaterThanOrEqual(400);
      expect(await res.text(), path).not.toContain("document.title");
    }
  });

  it("shows the text of a rejected HTML upload only inside JSON", async () => {
    const upload = await tusUpload(server, { bearer }, Buffer.from(HTML_PAGE), "not-an-edge-list.html");
    const created = await seeded.api.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name: SCRIPT });
    expect(created.status).toBe(202);
    const detail = await waitFor("the HTML upload to be rejected", async () => {
      const res = await get(`/api/graphs/${created.body.id}`);
      expect(res.headers.get("content-type")).toMatch(/^application\/json/);
      expect(res.headers.get("x-content-type-options")).toBe("nosniff");
      const graph = GraphDetailSchema.parse(await res.json());
      return graph.status === "rejected" || graph.status === "ready" ? graph : null;
    });
    expect(detail.status).toBe("rejected");
    expect(detail.name).toBe(SCRIPT);
    expect(detail.problems[0]).toMatchObject({ line: 2, reason: "wrong-column-count" });
    expect(detail.problems[0]?.text).toContain("<script>");
  });
});
