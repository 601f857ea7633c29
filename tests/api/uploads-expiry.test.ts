// Unfinished uploads expire: once older than STILLPOINT_UPLOAD_EXPIRY_HOURS they are swept (partial bytes deleted, row
// marked expired), stop counting against the team quota, and a tus HEAD or PATCH on them answers 410 Gone with a clear
// message. Finished uploads are never touched. The age is faked by moving `created_at` back in the database.
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { UploadPageSchema, type Upload } from "../../api/contracts/uploads";
import { ConfigError } from "../../api/src/config";
import { sweepExpiredUploads } from "../../api/src/features/uploads/upload-expiry";
import { uploadsDir } from "../../api/src/lib/data-paths";
import type { RunningServer } from "../../api/src/server";
import { tokenClient, tusUpload, waitFor } from "./portal-support";
import { removeDir, tempDataDir } from "./runner-support";
import { createTestTeam, startTestServer, testConfig, type ApiClient, type TestTeam } from "./support";

const QUOTA = 300_000;
const DECLARED = 200_000;

describe("unfinished uploads expire", () => {
  let server: RunningServer;
  let dataDir: string;
  let team: TestTeam;
  let api: ApiClient;

  const onDisk = (tusId: string) => existsSync(path.join(uploadsDir(dataDir), tusId));
  const sidecarOnDisk = (tusId: string) => existsSync(path.join(uploadsDir(dataDir), `${tusId}.json`));
  const uploads = async (client = api) => UploadPageSchema.parse((await client.get("/api/uploads?state=all&limit=200")).body);
  const find = async (tusId: string, client = api): Promise<Upload | undefined> =>
    (await uploads(client)).items.find((u) => u.tusId === tusId);
  /** Moves an upload's creation back by `hours`, in the database and in the tus store's record beside the file. */
  const age = async (tusId: string, hours: number) => {
    await server.deps.pool.query("UPDATE uploads SET created_at = created_at - INTERVAL ? HOUR WHERE tus_id = ?", [hours, tusId]);
    const sidecar = path.join(uploadsDir(dataDir), `${tusId}.json`);
    const info = JSON.parse(readFileSync(sidecar, "utf8")) as { creation_date: string };
    info.creation_date = new Date(Date.parse(info.creation_date) - hours * 3_600_000).toISOString();
    writeFileSync(sidecar, JSON.stringify(info));
  };
  const tusAuth = (client: ApiClient) => ({ authorization: `Bearer ${client.bearer}`, "tus-resumable": "1.0.0" });
  const head = (tusId: string, client = api) => fetch(`${server.url}/api/uploads/${tusId}`, { method: "HEAD", headers: tusAuth(client) });
  const patch = (tusId: string, offset: number, body: Buffer, client = api) =>
    fetch(`${server.url}/api/uploads/${tusId}`, {
      method: "PATCH",
      headers: { ...tusAuth(client), "upload-offset": String(offset), "content-type": "application/offset+octet-stream" },
      body: new Uint8Array(body),
    });

  /** Creates an upload of DECLARED bytes and sends only the first `sent` of them. */
  async function partialUpload(name: string, sent: number, client = api): Promise<{ tusId: string; created: Response; patched: Response }> {
    const created = await fetch(`${server.url}/api/uploads`, {
      method: "POST",
      headers: { ...tusAuth(client), "upload-length": String(DECLARED), "upload-metadata": `filename ${Buffer.from(name).toString("base64")}` },
    });
    expect(created.status).toBe(201);
    const tusId = (created.headers.get("location") ?? "").split("/").pop() ?? "";
    const patched = await patch(tusId, 0, Buffer.alloc(sent, "7,9\n"), client);
    expect(patched.status).toBe(204);
    return { tusId, created, patched };
  }

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    team = await createTestTeam(server, "expiry");
    api = await tokenClient(server, team.email.engineer);
  });

  afterAll(async () => {
    await server?.close();
    removeDir(dataDir);
  });

  it("reads STILLPOINT_UPLOAD_EXPIRY_HOURS (default 24) and refuses a zero or negative period", () => {
    expect(testConfig().uploads.expiryMs).toBe(24 * 3_600_000);
    expect(testConfig({ STILLPOINT_UPLOAD_EXPIRY_HOURS: "1.5" }).uploads.expiryMs).toBe(5_400_000);
    expect(() => testConfig({ STILLPOINT_UPLOAD_EXPIRY_HOURS: "0" })).toThrow(ConfigError);
    expect(() => testConfig({ STILLPOINT_UPLOAD_EXPIRY_HOURS: "-3" })).toThrow(/STILLPOINT_UPLOAD_EXPIRY_HOURS/);
  });

  it("advertises the expiration extension and when an unfinished upload expires", async () => {
    const options = await fetch(`${server.url}/api/uploads`, { method: "OPTIONS", headers: { "tus-resumable": "1.0.0" } });
    expect(options.headers.get("tus-extension")?.split(",")).toContain("expiration");

    const before = Date.now();
    const { tusId, created, patched } = await partialUpload("ferry-links-advertised.csv", 10_000);
    for (const res of [created, patched]) {
      const expires = Date.parse(res.headers.get("upload-expires") ?? "");
      // RFC 7231 dates have whole seconds.
      expect(expires).toBeGreaterThanOrEqual(before - 1000 + 24 * 3_600_000);
      expect(expires).toBeLessThanOrEqual(Date.now() + 24 * 3_600_000);
    }
    const listed = await find(tusId);
    expect(listed?.state).toBe("uploading");
    expect(Date.parse(listed?.expiresAt ?? "") - Date.parse(listed?.createdAt ?? "")).toBe(24 * 3_600_000);
    expect((await uploads()).limits.unfinishedExpiryHours).toBe(24);
  });

  it("sweeps an old unfinished upload: bytes deleted, row expired, quota freed, resume refused with 410", async () => {
    const tight = await createTestTeam(server, "expiry-quota");
    await server.deps.pool.query("UPDATE teams SET quotas = ? WHERE id = ?", [JSON.stringify({ maxStorageBytes: QUOTA }), tight.teamId]);
    const client = await tokenClient(server, tight.email.engineer);
    const { tusId } = await partialUpload("ferry-links-stale.csv", 50_000, client);
    const usedBefore = (await uploads(client)).limits.usedBytes;
    expect(usedBefore).toBeGreaterThanOrEqual(DECLARED);
    // The quota is taken: another upload of the same size does not fit.
    await expect(tusUpload(server, { bearer: client.bearer }, Buffer.alloc(DECLARED, "1,2\n"), "second.csv")).rejects.toThrow(/quota_exceeded/);

    // Not yet old enough: the sweep leaves it alone.
    await age(tusId, 23);
    await sweepExpiredUploads(server.deps);
    expect((await find(tusId, client))?.state).toBe("uploading");
    expect(onDisk(tusId)).toBe(true);

    await age(tusId, 2);
    expect(await sweepExpiredUploads(server.deps)).toBeGreaterThanOrEqual(1);
    const swept = await find(tusId, client);
    expect(swept).toMatchObject({ state: "expired", expiresAt: null });
    expect(onDisk(tusId)).toBe(false);
    expect(sidecarOnDisk(tusId)).toBe(false);
    expect((await uploads(client)).limits.usedBytes).toBe(usedBefore - DECLARED);

    const gone = await head(tusId, client);
    expect(gone.status).toBe(410);
    const refused = await patch(tusId, 50_000, Buffer.alloc(1000, "7,9\n"), client);
    expect(refused.status).toBe(410);
    const body = (await refused.json()) as { error: { code: string; message: string; details: { offset: number } } };
    expect(body.error.code).toBe("upload_expired");
    expect(body.error.message).toMatch(/not finished within 24 hours/);
    expect(body.error.message).toMatch(/Upload the file again/);
    expect(body.error.details.offset).toBe(50_000);
    expect(onDisk(tusId)).toBe(false);

    const graph = await client.post<{ error: { code: string } }>("/api/graphs", { uploadId: swept?.id, name: "Stale ferry links" });
    expect(graph.status).toBe(410);
    expect(graph.body.error.code).toBe("upload_expired");

    // With the quota freed, the same upload fits now.
    const second = await tusUpload(server, { bearer: client.bearer }, Buffer.alloc(DECLARED, "1,2\n"), "second.csv");
    expect(second.uploadId).toBeGreaterThan(0);

    const admin = await tokenClient(server, tight.email.admin);
    const activity = await admin.get<{ items: Array<{ action: string; target: string; actor: unknown }> }>("/api/activity");
    const entry = activity.body.items.find((a) => a.action === "upload.expired" && a.target.includes("ferry-links-stale.csv"));
    expect(entry?.actor).toBeNull();
  });

  it("refuses to resume an upload past its expiry even before the sweep reached it, and expires it there", async () => {
    const { tusId } = await partialUpload("harbour-crawl-late.csv", 20_000);
    await age(tusId, 25);
    const res = await head(tusId);
    expect(res.status).toBe(410);
    expect((await find(tusId))?.state).toBe("expired");
    expect(onDisk(tusId)).toBe(false);
  });

  it("never expires a finished upload, however old", async () => {
    const done = await tusUpload(server, { bearer: api.bearer }, Buffer.from("1,2\n2,3\n3,1\n"), "museum-links.csv");
    await age(done.tusId, 24 * 30);
    await sweepExpiredUploads(server.deps);
    expect((await find(done.tusId))?.state).toBe("complete");
    expect(onDisk(done.tusId)).toBe(true);
    const res = await head(done.tusId);
    expect(res.status).toBe(200);
    expect(res.headers.get("upload-offset")).toBe("12");
  });

  it("sweeps once when the server starts", async () => {
    const { tusId } = await partialUpload("council-pages-restart.csv", 5_000);
    await age(tusId, 48);
    const second = await startTestServer({ STILLPOINT_DATA_DIR: dataDir });
    try {
      await waitFor("the start-up sweep", async () => (await find(tusId))?.state === "expired", 20_000);
      expect(onDisk(tusId)).toBe(false);
    } finally {
      await second.close();
    }
  });
});
