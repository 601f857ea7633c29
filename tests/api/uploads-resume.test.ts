// Resumable uploads with the real tus client: interrupted at five seeded random offsets and resumed from the offset the
// server reports, the file ends byte-identical; concurrent uploads keep to their own bytes; uploads over the size limit
// or the team quota are refused with a clear message before a byte is stored.
import { createHash } from "node:crypto";
import { readdirSync, readFileSync } from "node:fs";
import path from "node:path";
import { Upload, type UploadOptions } from "tus-js-client";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { UPLOAD_ID_HEADER, UploadPageSchema } from "../../api/contracts/uploads";
import { uploadsDir } from "../../api/src/lib/data-paths";
import type { RunningServer } from "../../api/src/server";
import { tokenClient, tusUpload } from "./portal-support";
import { removeDir, tempDataDir } from "./runner-support";
import { createTestTeam, startTestServer, type ApiClient, type TestTeam } from "./support";
import { mulberry32 as seeded } from "../../workers/src/core/prng";

const MAX_UPLOAD = 4 * 2 ** 20;
const sha256 = (b: Buffer) => createHash("sha256").update(b).digest("hex");


/** An edge list of about `bytes` bytes with distinct lines, so that a misplaced chunk changes the digest. */
function edgeBytes(bytes: number, salt: number): Buffer {
  const lines: string[] = [];
  let size = 0;
  for (let i = 0; size < bytes; i++) {
    const line = `${i * 7 + salt},${(i * 13 + salt * 5) % 100_003}\n`;
    lines.push(line);
    size += line.length;
  }
  return Buffer.from(lines.join("")).subarray(0, bytes);
}

interface Attempt {
  /** Resolves with the upload URL when the upload finished, or null when it was aborted at `stopAt`. */
  done: Promise<string | null>;
}

/** One tus-js-client session: from the start, or resuming `uploadUrl` (the client asks the server for its offset). */
function attempt(server: RunningServer, bearer: string, data: Buffer, options: { uploadUrl?: string; stopAt?: number; extra?: Partial<UploadOptions> }): Attempt {
  const done = new Promise<string | null>((resolve, reject) => {
    let stopped = false;
    const upload: Upload = new Upload(data, {
      endpoint: `${server.url}/api/uploads`,
      uploadUrl: options.uploadUrl ?? null,
      headers: { authorization: `Bearer ${bearer}` },
      chunkSize: 64 * 1024,
      retryDelays: [],
      metadata: { filename: "kestrel-crawl-part.csv", filetype: "text/csv" },
      onProgress: (sent) => {
        if (!stopped && options.stopAt !== undefined && sent >= options.stopAt) {
          stopped = true;
          void upload.abort().then(() => resolve(null), reject);
        }
      },
      onError: (error) => (stopped ? resolve(null) : reject(error)),
      onSuccess: () => resolve(upload.url),
      ...options.extra,
    });
    if (options.uploadUrl) upload.url = options.uploadUrl;
    upload.start();
  });
  return { done };
}

describe("resumable uploads", () => {
  let server: RunningServer;
  let dataDir: string;
  let team: TestTeam;
  let api: ApiClient;
  let bearer: string;

  const head = async (url: string) => {
    const res = await fetch(url, { method: "HEAD", headers: { authorization: `Bearer ${bearer}`, "tus-resumable": "1.0.0" } });
    expect(res.status).toBe(200);
    return { offset: Number(res.headers.get("upload-offset")), length: Number(res.headers.get("upload-length")) };
  };

  /** The server's offset once an aborted request has been written out (two equal readings in a row). */
  const settledOffset = async (url: string) => {
    let last = -1;
    for (;;) {
      const { offset } = await head(url);
      if (offset === last) return offset;
      last = offset;
      await new Promise((resolve) => setTimeout(resolve, 60));
    }
  };

  const stored = (tusId: string) => readFileSync(path.join(uploadsDir(dataDir), tusId));
  const storedNames = () => readdirSync(uploadsDir(dataDir)).sort();

  beforeAll(async () => {
    dataDir = tempDataDir();
    server = await startTestServer({ STILLPOINT_DATA_DIR: dataDir, STILLPOINT_MAX_UPLOAD_BYTES: String(MAX_UPLOAD) });
    team = await createTestTeam(server, "resume");
    api = await tokenClient(server, team.email.engineer);
    bearer = api.bearer ?? "";
  });

  afterAll(async () => {
    await server?.close();
    removeDir(dataDir);
  });

  it("ends byte-identical after five interruptions at random offsets, each resumed from the server's offset", async () => {
    const SEED = 424_242;
    const rand = seeded(SEED);
    const data = edgeBytes(3 * 2 ** 20 + 12_345, 1);
    // One random cut in each fifth of the file: far enough apart (over a chunk) that every cut interrupts.
    const cuts = Array.from({ length: 5 }, (_, i) => Math.floor(((i + 0.1 + 0.8 * rand()) / 5) * data.length));

    let url: string | undefined;
    const offsets: number[] = [];
    for (const cut of cuts) {
      const result = await attempt(server, bearer, data, { uploadUrl: url, stopAt: cut }).done;
      expect(result, `aborted at ${cut} (seed ${SEED})`).toBeNull();
      if (!url) {
        const page = UploadPageSchema.parse((await api.get("/api/uploads?state=all&limit=200")).body);
        const partial = page.items.find((u) => u.state === "uploading" && u.size === data.length);
        expect(partial).toBeDefined();
        url = `${server.url}/api/uploads/${partial?.tusId}`;
      }
      const offset = await settledOffset(url);
      expect(offset).toBeLessThan(data.length);
      expect(offset).toBeGreaterThan(offsets.at(-1) ?? 0);
      expect((await head(url)).length).toBe(data.length);
      const tusId = url.split("/").pop() ?? "";
      // What the server holds so far is exactly the start of the file.
      expect(stored(tusId).equals(data.subarray(0, offset))).toBe(true);
      offsets.push(offset);
    }
    expect(offsets).toHaveLength(5);

    const finished = await attempt(server, bearer, data, { uploadUrl: url }).done;
    expect(finished).toBe(url);
    const tusId = (url ?? "").split("/").pop() ?? "";
    expect(sha256(stored(tusId))).toBe(sha256(data));
    const page = UploadPageSchema.parse((await api.get("/api/uploads?state=all&limit=200")).body);
    expect(page.items.find((u) => u.tusId === tusId)).toMatchObject({ state: "complete", size: data.length, offset: data.length, checksum: `sha256:${sha256(data)}` });
  });

  it("keeps two simultaneous uploads apart, one of them interrupted and resumed meanwhile", async () => {
    // Different sizes: the interrupted one is found in the list by its size.
    const a = edgeBytes(900_000, 2);
    const b = edgeBytes(850_000, 3);
    const steady = tusUpload(server, { bearer }, a, "council-links.csv", { chunkSize: 32 * 1024 });
    const interrupted = attempt(server, bearer, b, { stopAt: 400_000, extra: { chunkSize: 32 * 1024 } }).done;
    expect(await interrupted).toBeNull();
    const partial = UploadPageSchema.parse((await api.get("/api/uploads?state=all&limit=200")).body).items.find(
      (u) => u.state === "uploading" && u.size === b.length,
    );
    const url = `${server.url}/api/uploads/${partial?.tusId}`;
    await settledOffset(url);
    const [first, second] = await Promise.all([steady, attempt(server, bearer, b, { uploadUrl: url }).done]);
    expect(second).toBe(url);
    expect(sha256(stored(first.tusId))).toBe(sha256(a));
    expect(sha256(stored(partial?.tusId ?? ""))).toBe(sha256(b));
    expect(sha256(a)).not.toBe(sha256(b));
  });

  it("refuses an upload over the size limit at creation, with the sizes in the message and nothing stored", async () => {
    const before = storedNames();
    const rows = UploadPageSchema.parse((await api.get("/api/uploads?state=all&limit=200")).body).items.length;
    const big = Buffer.alloc(MAX_UPLOAD + 1, "1,2\n");
    for (const uploadDataDuringCreation of [false, true]) {
      const error = await attempt(server, bearer, big, { extra: { uploadDataDuringCreation } }).done.then(
        () => null,
        (e: unknown) => e,
      );
      expect(String(error)).toMatch(/413/);
      expect(String(error)).toMatch(/upload_too_large/);
      expect(String(error)).toMatch(/at most 4\.0 MiB/);
    }
    expect(storedNames()).toEqual(before);
    expect(UploadPageSchema.parse((await api.get("/api/uploads?state=all&limit=200")).body).items.length).toBe(rows);
  });

  it("refuses a deferred length, and bytes beyond the declared length", async () => {
    const auth = { authorization: `Bearer ${bearer}`, "tus-resumable": "1.0.0" };
    const before = storedNames();
    const deferred = await fetch(`${server.url}/api/uploads`, {
      method: "POST",
      headers: { ...auth, "upload-defer-length": "1", "upload-metadata": `filename ${Buffer.from("later.csv").toString("base64")}` },
    });
    expect(deferred.status).toBe(400);
    expect(((await deferred.json()) as { error: { message: string } }).error.message).toMatch(/Upload-Length/);
    expect(storedNames()).toEqual(before);

    const created = await fetch(`${server.url}/api/uploads`, {
      method: "POST",
      headers: { ...auth, "upload-length": "8", "upload-metadata": `filename ${Buffer.from("short.csv").toString("base64")}` },
    });
    expect(created.status).toBe(201);
    const url = new URL(created.headers.get("location") ?? "", server.url).toString();
    const over = await fetch(url, {
      method: "PATCH",
      headers: { ...auth, "upload-offset": "0", "content-type": "application/offset+octet-stream" },
      body: "1,2\n2,3\n3,1\n4,1\n",
    });
    expect(over.status).toBeGreaterThanOrEqual(400);
    expect(over.status).toBeLessThan(500);
    expect(over.headers.get(UPLOAD_ID_HEADER)).toBeNull();
    expect(stored(url.split("/").pop() ?? "").length).toBeLessThanOrEqual(8);
  });

  it("refuses uploads over the team quota, also when two arrive at once, before storing them", async () => {
    const small = await createTestTeam(server, "quota");
    await server.deps.pool.query("UPDATE teams SET quotas = ? WHERE id = ?", [JSON.stringify({ maxStorageBytes: 150_000 }), small.teamId]);
    const client = await tokenClient(server, small.email.engineer);
    const before = storedNames();
    const results = await Promise.allSettled([
      tusUpload(server, { bearer: client.bearer }, edgeBytes(100_000, 4), "harbour-a.csv"),
      tusUpload(server, { bearer: client.bearer }, edgeBytes(100_000, 5), "harbour-b.csv"),
    ]);
    const ok = results.filter((r) => r.status === "fulfilled");
    const refused = results.filter((r): r is PromiseRejectedResult => r.status === "rejected");
    expect(ok).toHaveLength(1);
    expect(refused).toHaveLength(1);
    expect(String(refused[0].reason)).toMatch(/quota_exceeded/);
    expect(String(refused[0].reason)).toMatch(/storage quota/);
    const added = storedNames().filter((n) => !before.includes(n) && !n.endsWith(".json"));
    expect(added).toHaveLength(1);
    const page = UploadPageSchema.parse((await client.get("/api/uploads?state=all")).body);
    expect(page.items).toHaveLength(1);
    expect(page.limits).toMatchObject({ quotaBytes: 150_000, usedBytes: 100_000 });
  });
});
