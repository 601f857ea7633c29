// Path traversal through names: upload file names (tus metadata), graph names, tus ids, node ids and run ids never
// reach the file system as paths. Names are stored as labels (neutralised for display and downloads) or refused.
import { existsSync, readdirSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { UploadPageSchema } from "../../api/contracts/uploads";
import { uploadsDir } from "../../api/src/lib/data-paths";
import type { RunningServer } from "../../api/src/server";
import type { Runner } from "../../workers/src/runner/main";
import { tusUpload, waitFor } from "./portal-support";
import { graphRow, removeDir, tempDataDir } from "./runner-support";
import { createTeams, runnerFor, seedTeam, type SeededTeam } from "./security-support";
import { startTestServer } from "./support";

/** Every file below dir, relative to it. */
function walk(dir: string, prefix = ""): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? walk(path.join(dir, e.name), path.join(prefix, e.name)) : [path.join(prefix, e.name)],
  );
}

const FILE_NAMES: Array<[string, string]> = [
  ["../../etc/passwd", "passwd"],
  ["../../../kestrel-escape.csv", "kestrel-escape.csv"],
  ["/etc/shadow", "shadow"],
  ["C:\\Windows\\win.ini", "win.ini"],
  ["..\\..\\ferry\\boot.ini", "boot.ini"],
  ["harbour\u0000.csv", "harbour.csv"],
  ["museum.csv\u0000../../x", "x"],
  ["..", "upload"],
  ["sub/dir/", "upload"],
  ["%2e%2e%2fetc%2fpasswd", "%2e%2e%2fetc%2fpasswd"],
  ["\u202ecsv.exe", "csv.exe"],
  ["tide\ttable\r\n.csv", "tidetable.csv"],
  ["k".repeat(300), "k".repeat(200)],
];

describe("names never become paths", () => {
  let server: RunningServer;
  let runner: Runner;
  let dataDir: string;
  let seeded: SeededTeam;
  let bearer: string;

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    const [team] = await createTeams(server, ["paths"]);
    runner = await runnerFor(dataDir, [team]);
    // A NUL in a graph name is refused outright (see the cases below); the traversal stays a plain label.
    seeded = await seedTeam(server, team, { graphName: "../../etc/passwd.csv", filename: "../../tidal.csv" });
    bearer = seeded.api.bearer ?? "";
  });

  afterAll(async () => {
    await runner?.stop();
    await server?.close();
    removeDir(dataDir);
  });

  it("keeps only the last segment of an upload's file name, without control or bidi characters", async () => {
    const uploaded = new Map<number, string>();
    for (const [raw, shown] of FILE_NAMES) {
      const upload = await tusUpload(server, { bearer }, Buffer.from("1 2\n2 3\n"), raw);
      uploaded.set(upload.uploadId, shown);
    }
    const page = UploadPageSchema.parse((await seeded.api.get("/api/uploads?limit=100")).body);
    for (const [id, shown] of uploaded) {
      const item = page.items.find((u) => u.id === id);
      expect(item?.filename).toBe(shown);
      expect(item?.filename).not.toMatch(/[/\\\u0000-\u001f\u202a-\u202e]/);
    }
  });

  it("stores every upload as uploads/<tus id>, and nothing outside the uploads folder", () => {
    const dir = uploadsDir(dataDir);
    for (const name of readdirSync(dir)) expect(name).toMatch(/^[0-9a-f]{32}(\.json)?$/);
    const stray = walk(dataDir).filter((f) => /passwd|shadow|win\.ini|boot\.ini|escape|harbour\.csv/.test(f));
    expect(stray).toEqual([]);
    for (const [raw] of FILE_NAMES.slice(0, 2)) expect(existsSync(path.resolve(dir, raw))).toBe(false);
  });

  it("keeps a graph name as a label: storage is graphs/<id>, the download name is neutralised", async () => {
    const graph = await graphRow(server.deps.db, seeded.graphId);
    expect(graph.storagePath).toBe(path.join("graphs", String(seeded.graphId)));
    const res = await fetch(`${server.url}/api/runs/${seeded.runId}/scores.csv`, { headers: { authorization: `Bearer ${bearer}` } });
    expect(res.status).toBe(200);
    const disposition = res.headers.get("content-disposition") ?? "";
    const filename = /filename="([^"]*)"/.exec(disposition)?.[1] ?? "";
    expect(filename).toMatch(/^[A-Za-z0-9._-]+$/);
    expect(filename).not.toMatch(/^\.|\.\.\//);
    expect(filename.endsWith(`-run${seeded.runId}-scores.csv`)).toBe(true);
    await res.arrayBuffer();
  });

  it.each([["../../../etc/passwd"], ["/var/lib/stillpoint/graphs/1"], ["C:\\temp\\graph"], ["tide\u0000table"], [".."]])(
    "a graph named %j is stored under its id or refused, never written by name",
    async (name) => {
      const upload = await tusUpload(server, { bearer }, Buffer.from("1 2\n2 3\n3 1\n"), "loop.txt");
      const res = await seeded.api.post<{ id: number }>("/api/graphs", { uploadId: upload.uploadId, name });
      expect([202, 400]).toContain(res.status);
      if (res.status === 400) return;
      const row = await waitFor("the graph to be ingested", async () => {
        const g = await graphRow(server.deps.db, res.body.id);
        return g.status === "ready" || g.status === "rejected" ? g : null;
      });
      expect(row.status).toBe("ready");
      expect(row.storagePath).toBe(path.join("graphs", String(res.body.id)));
      const detail = await seeded.api.get<{ name: string }>(`/api/graphs/${res.body.id}`);
      expect(detail.status).toBe(200);
      expect(detail.body.name).toBe(name);
      for (const f of walk(dataDir)) expect(f.startsWith("graphs/") || f.startsWith("uploads/") || f.startsWith("runs/")).toBe(true);
    },
  );

  it("refuses traversal in tus ids, run ids and node ids", async () => {
    const auth = { authorization: `Bearer ${bearer}`, "tus-resumable": "1.0.0" };
    for (const id of ["..%2F..%2Fetc%2Fpasswd", "%2e%2e", "..%5C..%5Cwin.ini", `${seeded.tusId}%00.json`, `${seeded.tusId}.json`]) {
      for (const method of ["HEAD", "PATCH", "DELETE"]) {
        const res = await fetch(`${server.url}/api/uploads/${id}`, {
          method,
          headers: { ...auth, "upload-offset": "0", "content-type": "application/offset+octet-stream" },
          body: method === "PATCH" ? "9 9\n" : undefined,
        });
        expect(res.status, `${method} ${id}`).toBeGreaterThanOrEqual(400);
        expect(res.status, `${method} ${id}`).toBeLessThan(500);
      }
    }
    const run = seeded.runId;
    for (const p of [`/api/runs/..%2F${run}/scores.csv`, `/api/runs/${run}%2F..%2F..%2Fuploads/scores.csv`, "/api/graphs/..%2F..%2Fetc"]) {
      const res = await fetch(server.url + p, { headers: auth });
      expect(res.status, p).toBe(400);
    }
    const node = await fetch(`${server.url}/api/runs/${run}/nodes/${encodeURIComponent("../../../../etc/passwd")}`, { headers: auth });
    expect(node.status).toBe(404);
    expect(((await node.json()) as { error: { code: string } }).error.code).toBe("not_found");
    expect(existsSync(path.join(uploadsDir(dataDir), seeded.tusId))).toBe(true);
    const stray = walk(dataDir).filter((f) => !/^(uploads|graphs|runs)\//.test(f));
    expect(stray).toEqual([]);
  });
});
