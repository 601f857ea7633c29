// Write a prepared graph directory atomically: everything goes into a temporary sibling directory, each file is
// flushed to disk, then one rename puts the directory in place (a replaced directory is renamed aside first, then
// removed). A reader never sees a half-written store.

import { createHash } from "node:crypto";
import { endianness } from "node:os";
import { mkdir, open, rename, rm, stat } from "node:fs/promises";
import { basename, dirname, join } from "node:path";
import type { Graph } from "../core/graph";
import { defaultPieces, pieceName, planPieces, STORE_FORMAT, STORE_VERSION, type StoredFile, type StoredPiece, type StoreMeta } from "./format";

export interface WriteStoreInput {
  /** Graph options and ingest statistics (JSON-serializable). */
  options?: object;
  stats?: object;
  fingerprint?: string | null;
  /** Number of CSR pieces (default: about 8M edges each). */
  pieces?: number;
}

export async function writeGraphStore(dir: string, graph: Graph, input: WriteStoreInput = {}): Promise<StoreMeta> {
  if (endianness() !== "LE") throw new Error("graph stores are little-endian; this host is big-endian");
  const tmp = join(dirname(dir), `.${basename(dir)}.tmp-${process.pid}-${Date.now().toString(36)}`);
  await mkdir(tmp, { recursive: true });
  try {
    const put = (name: string, a: ArrayBufferView) => writeFileSynced(join(tmp, name), a);
    const n = graph.n;
    const ids = graph.ids.kind === "integer" ? await put("ids.u64", graph.ids.ids) : await put("ids.bytes", graph.ids.bytes);
    const idOffsets = graph.ids.kind === "string" ? await put("ids.offsets.u32", graph.ids.offsets) : null;
    const outWeight = await put("out-weight.f64", graph.outWeight);
    const count = input.pieces ?? defaultPieces(n, graph.m);
    const pieces: StoredPiece[] = [];
    for (const [index, { start, end }] of planPieces(graph.inOffsets, n, count).entries()) {
      const base = graph.inOffsets[start];
      const offsets = new Uint32Array(end - start + 1);
      for (let v = start; v <= end; v++) offsets[v - start] = graph.inOffsets[v] - base;
      const e0 = base;
      const e1 = graph.inOffsets[end];
      pieces.push({
        index,
        start,
        end,
        edges: e1 - e0,
        offsets: await put(pieceName(index, "offsets.u32"), offsets),
        sources: await put(pieceName(index, "sources.u32"), graph.sources.subarray(e0, e1)),
        weights: graph.weights ? await put(pieceName(index, "weights.f64"), graph.weights.subarray(e0, e1)) : null,
      });
    }
    const meta: StoreMeta = {
      format: STORE_FORMAT,
      version: STORE_VERSION,
      createdAt: new Date().toISOString(),
      n,
      m: graph.m,
      ...(graph.mergedEdges !== undefined ? { mergedEdges: graph.mergedEdges } : {}),
      idKind: graph.ids.kind,
      weighted: graph.weights !== null,
      fingerprint: input.fingerprint ?? null,
      options: { ...(input.options ?? {}) },
      stats: { ...(input.stats ?? {}) },
      files: { ids, idOffsets, outWeight },
      pieces,
    };
    await writeFileSynced(join(tmp, "meta.json"), new TextEncoder().encode(`${JSON.stringify(meta, null, 2)}\n`));
    await syncDir(tmp);
    await replaceDir(tmp, dir);
    return meta;
  } catch (e) {
    await rm(tmp, { recursive: true, force: true });
    throw e;
  }
}

async function writeFileSynced(path: string, a: ArrayBufferView): Promise<StoredFile> {
  const bytes = new Uint8Array(a.buffer, a.byteOffset, a.byteLength);
  const fh = await open(path, "w");
  try {
    for (let at = 0; at < bytes.length; ) {
      const { bytesWritten } = await fh.write(bytes, at, Math.min(bytes.length - at, 1 << 26));
      at += bytesWritten;
    }
    await fh.sync();
  } finally {
    await fh.close();
  }
  return { name: basename(path), bytes: bytes.length, sha256: createHash("sha256").update(bytes).digest("hex") };
}

async function syncDir(path: string): Promise<void> {
  const fh = await open(path, "r");
  try {
    await fh.sync();
  } finally {
    await fh.close();
  }
}

async function replaceDir(tmp: string, dir: string): Promise<void> {
  const existing = await stat(dir).then(
    () => true,
    () => false,
  );
  if (!existing) {
    await rename(tmp, dir);
  } else {
    const aside = join(dirname(dir), `.${basename(dir)}.old-${process.pid}-${Date.now().toString(36)}`);
    await rename(dir, aside);
    await rename(tmp, dir);
    await rm(aside, { recursive: true, force: true });
  }
  await syncDir(dirname(dir));
}
