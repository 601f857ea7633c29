// Checkpoints of the iterate x_k, one file per run replaced atomically (temp file + fsync + rename).
// Layout (little-endian):
//   0..8    magic "SPCHKPT1"
//   8..16   n   (float64, an integer)
//   16..24  k   (float64, an integer)
//   24..56  sha256 of the payload
//   56..64  zero
//   64..    x_k: n float64 values
import { createHash } from "node:crypto";
import { mkdir, readFile, rm } from "node:fs/promises";
import { endianness } from "node:os";
import path from "node:path";
import { writeAtomic } from "../output/atomic-file";

const MAGIC = "SPCHKPT1";
const HEADER_BYTES = 64;
export const CHECKPOINT_FILE = "checkpoint.f64";

export interface Checkpoint {
  k: number;
  x: Float64Array;
}

export type CheckpointRead = { kind: "none" } | { kind: "ok"; checkpoint: Checkpoint } | { kind: "unusable"; reason: string };

export function checkpointPath(runDir: string): string {
  return path.join(runDir, CHECKPOINT_FILE);
}

export async function writeCheckpoint(runDir: string, k: number, x: Float64Array): Promise<void> {
  if (endianness() !== "LE") throw new Error("checkpoints are little-endian; this host is big-endian");
  await mkdir(runDir, { recursive: true });
  const payload = new Uint8Array(x.buffer, x.byteOffset, x.byteLength);
  const header = Buffer.alloc(HEADER_BYTES);
  header.write(MAGIC, 0, "latin1");
  header.writeDoubleLE(x.length, 8);
  header.writeDoubleLE(k, 16);
  createHash("sha256").update(payload).digest().copy(header, 24);
  await writeAtomic(checkpointPath(runDir), async (fh) => {
    await fh.write(header);
    for (let at = 0; at < payload.length; ) {
      const { bytesWritten } = await fh.write(payload, at, Math.min(payload.length - at, 1 << 26));
      at += bytesWritten;
    }
  });
}

/** The run's checkpoint for a graph of n nodes; a torn, foreign or mismatched file is reported, never trusted. */
export async function readCheckpoint(runDir: string, n: number): Promise<CheckpointRead> {
  let bytes: Buffer;
  try {
    bytes = await readFile(checkpointPath(runDir));
  } catch (error) {
    if ((error as NodeJS.ErrnoException).code === "ENOENT") return { kind: "none" };
    return { kind: "unusable", reason: `cannot read the checkpoint: ${(error as Error).message}` };
  }
  if (bytes.length < HEADER_BYTES || bytes.toString("latin1", 0, 8) !== MAGIC) return { kind: "unusable", reason: "not a checkpoint file" };
  const storedN = bytes.readDoubleLE(8);
  const k = bytes.readDoubleLE(16);
  if (storedN !== n) return { kind: "unusable", reason: `checkpoint holds ${storedN} nodes, the graph has ${n}` };
  if (!Number.isInteger(k) || k < 0) return { kind: "unusable", reason: `checkpoint iteration ${k} is not valid` };
  if (bytes.length !== HEADER_BYTES + n * 8) return { kind: "unusable", reason: `checkpoint has ${bytes.length} bytes, expected ${HEADER_BYTES + n * 8}` };
  const x = new Float64Array(n);
  const payload = new Uint8Array(x.buffer);
  payload.set(bytes.subarray(HEADER_BYTES));
  const digest = createHash("sha256").update(payload).digest();
  if (!digest.equals(bytes.subarray(24, 56))) return { kind: "unusable", reason: "checkpoint does not match its checksum" };
  return { kind: "ok", checkpoint: { k, x } };
}

export async function removeCheckpoint(runDir: string): Promise<void> {
  await rm(checkpointPath(runDir), { force: true });
}
