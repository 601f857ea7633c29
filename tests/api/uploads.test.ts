import { existsSync, readdirSync, readFileSync } from "node:fs";
import { createHash } from "node:crypto";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { UploadPageSchema } from "../../api/contracts/uploads";
import { uploadsDir } from "../../api/src/lib/data-paths";
import type { RunningServer } from "../../api/src/server";
import { tokenClient, tusUpload } from "./portal-support";
import { ApiClient, createTestTeam, signedIn, startTestServer, type TestTeam } from "./support";

describe("uploads over tus", () => {
  let server: RunningServer;
  let team: TestTeam;
  let engineer: ApiClient;
  beforeAll(async () => {
    server = await startTestServer({ STILLPOINT_MAX_UPLOAD_BYTES: String(1024 * 1024), STILLPOINT_LOG_LEVEL: process.env.PA_LOG ?? "silent" });
    team = await createTestTeam(server, "uploads");
    engineer = await tokenClient(server, team.email.engineer);
  });
  afterAll(() => server.close());

  it("stores a file sent in several PATCH requests byte for byte, checksums it and lists it", async () => {
    const data = Buffer.from("source,target\n".concat(Array.from({ length: 5000 }, (_, i) => `${i},${(i * 7) % 5000}\n`).join("")));
    const result = await tusUpload(server, { bearer: engineer.bearer }, data, "../../etc/kestrel\u202eedges.csv", { chunkSize: 8192 });
    expect(result.uploadId).toBeGreaterThan(0);
    expect(result.tusId).toMatch(/^[0-9a-f]{32}$/);
    const stored = readFileSync(path.join(uploadsDir(server.deps.config.dataDir), result.tusId));
    expect(stored.equals(data)).toBe(true);

    const list = await engineer.get("/api/uploads");
    expect(list.status).toBe(200);
    const page = UploadPageSchema.parse(list.body);
    const mine = page.items.find((u) => u.id === result.uploadId);
    expect(mine).toMatchObject({
      state: "complete",
      size: data.length,
      offset: data.length,
      filename: "kestreledges.csv",
      checksum: `sha256:${createHash("sha256").update(data).digest("hex")}`,
    });
    expect(page.limits.maxUploadBytes).toBe(1024 * 1024);
    expect(page.limits.usedBytes).toBeGreaterThanOrEqual(data.length);
  });

  it("resumes an interrupted upload from the offset the server reports", async () => {
    const data = Buffer.alloc(200_000, "12,13\n");
    let aborted = false;
    const first = tusUpload(server, { bearer: engineer.bearer }, data, "resume.csv", {
      chunkSize: 16_384,
      onProgress: (sent, upload) => {
        if (!aborted && sent >= 50_000) {
          aborted = true;
          void upload.abort();
        }
      },
    }).catch(() => null);
    await new Promise((resolve) => setTimeout(resolve, 500));
    expect(await Promise.race([first, Promise.resolve("pending")])).toBe("pending");
    const list = await engineer.get<{ items: Array<{ tusId: string; offset: number; state: string; size: number }> }>("/api/uploads?state=all");
    const partial = list.body.items.find((u) => u.state === "uploading" && u.size === data.length);
    expect(partial).toBeDefined();
    if (!partial) return;
    const head = await fetch(`${server.url}/api/uploads/${partial.tusId}`, {
      method: "HEAD",
      headers: { authorization: `Bearer ${engineer.bearer}`, "tus-resumable": "1.0.0" },
    });
    expect(head.status).toBe(200);
    const offset = Number(head.headers.get("upload-offset"));
    expect(offset).toBeGreaterThan(0);
    expect(offset).toBeLessThan(data.length);
    expect(partial.offset).toBe(offset);

    const rest = await fetch(`${server.url}/api/uploads/${partial.tusId}`, {
      method: "PATCH",
      headers: {
        authorization: `Bearer ${engineer.bearer}`,
        "tus-resumable": "1.0.0",
        "upload-offset": String(offset),
        "content-type": "application/offset+octet-stream",
      },
      body: data.subarray(offset),
    });
    expect(rest.status).toBe(204);
    expect(Number(rest.headers.get("stillpoint-upload-id"))).toBeGreaterThan(0);
    expect(readFileSync(path.join(uploadsDir(server.deps.config.dataDir), partial.tusId)).equals(data)).toBe(true);
  });

  it("refuses an upload over the size limit at creation, before any byte is stored", async () => {
    const before = readdirSync(uploadsDir(server.deps.config.dataDir)).length;
    const res = await fetch(`${server.url}/api/uploads`, {
      method: "POST",
      headers: {
        authorization: `Bearer ${engineer.bearer}`,
        "tus-resumable": "1.0.0",
        "upload-length": String(2 * 1024 * 1024),
        "upload-metadata": `filename ${Buffer.from("huge.csv").toString("base64")}`,
      },
    });
    expect(res.status).toBe(413);
    const body = (await res.json()) as { error: { code: string; message: string } };
    expect(body.error.code).toBe("upload_too_large");
    expect(body.error.message).toMatch(/2\.0 MiB.*at most 1\.0 MiB/);
    expect(readdirSync(uploadsDir(server.deps.config.dataDir)).length).toBe(before);
  });

  it("refuses an upload that would exceed the team quota", async () => {
    const other = await createTestTeam(server, "quota");
    await server.deps.pool.query("UPDATE teams SET quotas = ? WHERE id = ?", [JSON.stringify({ maxStorageBytes: 1000 }), other.teamId]);
    const client = await tokenClient(server, other.email.engineer);
    await expect(tusUpload(server, { bearer: client.bearer }, Buffer.alloc(1500, "1,2\n"), "big.csv")).rejects.toThrow(/quota/);
    const ok = await tusUpload(server, { bearer: client.bearer }, Buffer.alloc(800, "1,2\n"), "small.csv");
    expect(ok.uploadId).toBeGreaterThan(0);
    await expect(tusUpload(server, { bearer: client.bearer }, Buffer.alloc(300, "1,2\n"), "more.csv")).rejects.toThrow(/quota/);
  });

  it("works with a session cookie and the CSRF header, and refuses viewers and other teams", async () => {
    const session = await signedIn(server, team.email.engineer);
    const cookie = [...session.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
    const ok = await tusUpload(server, { cookie, csrf: session.csrfToken }, Buffer.from("a,b\n"), "cookie.csv");
    expect(ok.uploadId).toBeGreaterThan(0);
    await expect(tusUpload(server, { cookie, csrf: null }, Buffer.from("a,b\n"), "no-csrf.csv")).rejects.toThrow(/403/);

    const viewer = await tokenClient(server, team.email.engineer).then(() => signedIn(server, team.email.viewer));
    const vcookie = [...viewer.cookies].map(([k, v]) => `${k}=${v}`).join("; ");
    await expect(tusUpload(server, { cookie: vcookie, csrf: viewer.csrfToken }, Buffer.from("a,b\n"), "v.csv")).rejects.toThrow(/403/);

    const stranger = await createTestTeam(server, "stranger");
    const strangerClient = await tokenClient(server, stranger.email.engineer);
    const head = await fetch(`${server.url}/api/uploads/${ok.tusId}`, {
      method: "HEAD",
      headers: { authorization: `Bearer ${strangerClient.bearer}`, "tus-resumable": "1.0.0" },
    });
    expect(head.status).toBe(404);
    expect(existsSync(path.join(uploadsDir(server.deps.config.dataDir), ok.tusId))).toBe(true);
  });
});
