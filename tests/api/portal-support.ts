import { Upload } from "tus-js-client";
import { UPLOAD_ID_HEADER } from "../../api/contracts/uploads";
import type { RunningServer } from "../../api/src/server";
import { ApiClient, signedIn } from "./support";

/** A client that authenticates with a fresh API token of the given user (no cookie, no CSRF). */
export async function tokenClient(server: RunningServer, email: string): Promise<ApiClient> {
  const session = await signedIn(server, email);
  const res = await session.post<{ token: string }>("/api/tokens", { name: "portal test" });
  if (res.status !== 201) throw new Error(`token creation failed: ${res.status} ${JSON.stringify(res.body)}`);
  const client = new ApiClient(server.url);
  client.bearer = res.body.token;
  return client;
}

export interface TusResult {
  url: string;
  tusId: string;
  uploadId: number;
}

/** Uploads bytes with the real tus protocol (tus-js-client), in small chunks so several PATCH requests happen. */
export function tusUpload(
  server: RunningServer,
  auth: { bearer?: string | null; cookie?: string; csrf?: string | null },
  data: Buffer,
  filename: string,
  options: { chunkSize?: number; onProgress?: (sent: number, upload: Upload) => void } = {},
): Promise<TusResult> {
  return new Promise((resolve, reject) => {
    const headers: Record<string, string> = {};
    if (auth.bearer) headers.authorization = `Bearer ${auth.bearer}`;
    if (auth.cookie) headers.cookie = auth.cookie;
    if (auth.csrf) headers["x-csrf-token"] = auth.csrf;
    let uploadId = 0;
    const upload = new Upload(data, {
      endpoint: `${server.url}/api/uploads`,
      headers,
      chunkSize: options.chunkSize ?? 64 * 1024,
      retryDelays: [],
      metadata: { filename, filetype: "text/csv" },
      onAfterResponse: (_req, res) => {
        const id = res.getHeader(UPLOAD_ID_HEADER);
        if (id) uploadId = Number(id);
      },
      onProgress: (sent) => options.onProgress?.(sent, upload),
      onError: reject,
      onSuccess: () => {
        const url = upload.url ?? "";
        resolve({ url, tusId: url.split("/").pop() ?? "", uploadId });
      },
    });
    upload.start();
  });
}

export async function waitFor<T>(what: string, probe: () => Promise<T | null | undefined | false>, timeoutMs = 60_000): Promise<T> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const value = await probe();
    if (value) return value;
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((resolve) => setTimeout(resolve, 100));
  }
}

/** A small deterministic directed graph as an edge list: a ring plus pseudo-random chords over string or integer ids. */
export function edgeList(nodes: number, chords: number, seed = 7, label = (v: number) => String(v)): string {
  let state = seed >>> 0;
  const next = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    return state;
  };
  const lines = ["source,target"];
  for (let v = 0; v < nodes; v++) lines.push(`${label(v)},${label((v + 1) % nodes)}`);
  for (let i = 0; i < chords; i++) {
    const u = next() % nodes;
    const v = next() % Math.max(1, Math.floor(nodes / 10));
    if (u !== v) lines.push(`${label(u)},${label(v)}`);
  }
  return `${lines.join("\n")}\n`;
}
