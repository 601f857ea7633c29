// Atomic file replacement: write a temp file in the target folder, fsync, then rename over the target.
import { randomBytes } from "node:crypto";
import { open, rename, rm, type FileHandle } from "node:fs/promises";
import { basename, dirname, join } from "node:path";

/** Runs `write` against a temp file next to `path` and renames it into place; the temp file is removed on error. */
export async function writeAtomic(path: string, write: (fh: FileHandle) => Promise<void>): Promise<void> {
  const tmp = join(dirname(path), `.${basename(path)}.${process.pid}.${randomBytes(4).toString("hex")}.tmp`);
  const fh = await open(tmp, "wx");
  try {
    await write(fh);
    await fh.sync();
    await fh.close();
    await rename(tmp, path);
  } catch (err) {
    await fh.close().catch(() => undefined);
    await rm(tmp, { force: true });
    throw err;
  }
}
