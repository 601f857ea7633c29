// The text of sampled bad lines, for the validation report. The ingest reports line numbers only; this reads the
// file once more (gunzipping when needed) and stops after the last wanted line.
import { createReadStream } from "node:fs";
import { open } from "node:fs/promises";
import type { Readable } from "node:stream";
import { createGunzip } from "node:zlib";

/** Longest text kept per line, in bytes; the column holds 1024 characters. */
const KEEP_BYTES = 1024;
const utf8 = new TextDecoder("utf-8");

async function isGzip(file: string): Promise<boolean> {
  const fh = await open(file, "r");
  try {
    const magic = Buffer.alloc(2);
    const { bytesRead } = await fh.read(magic, 0, 2, 0);
    return bytesRead === 2 && magic[0] === 0x1f && magic[1] === 0x8b;
  } finally {
    await fh.close();
  }
}

function clean(bytes: Uint8Array): string {
  let end = bytes.length;
  if (end > 0 && bytes[end - 1] === 13) end--;
  // NUL cannot be shown; the replacement keeps the length and position of what was there.
  return [...utf8.decode(bytes.subarray(0, end)).replaceAll("\0", "\u2400")].slice(0, KEEP_BYTES).join("");
}

/** Text of each wanted 1-based physical line; missing entries mean the file ended (or could not be read) first. */
export async function readLineTexts(file: string, lineNumbers: readonly number[]): Promise<Map<number, string>> {
  const out = new Map<number, string>();
  const wanted = new Set(lineNumbers);
  if (wanted.size === 0) return out;
  const last = Math.max(...wanted);
  let raw: Readable | null = null;
  let stream: Readable | null = null;
  try {
    raw = createReadStream(file);
    stream = (await isGzip(file)) ? raw.pipe(createGunzip()) : raw;
    let line = 1;
    let kept: Uint8Array[] = [];
    let keptBytes = 0;
    let first = true;
    for await (const piece of stream as AsyncIterable<Buffer>) {
      let buf: Uint8Array = piece;
      if (first) {
        first = false;
        if (buf[0] === 0xef && buf[1] === 0xbb && buf[2] === 0xbf) buf = buf.subarray(3);
      }
      let at = 0;
      while (at < buf.length) {
        const nl = buf.indexOf(10, at);
        const end = nl < 0 ? buf.length : nl;
        if (wanted.has(line) && keptBytes < KEEP_BYTES + 4) {
          const part = buf.subarray(at, Math.min(end, at + KEEP_BYTES + 4 - keptBytes));
          kept.push(part);
          keptBytes += part.length;
        }
        if (nl < 0) break;
        if (wanted.has(line)) out.set(line, clean(Buffer.concat(kept)));
        kept = [];
        keptBytes = 0;
        line++;
        if (line > last) return out;
        at = nl + 1;
      }
    }
    if (wanted.has(line) && kept.length > 0) out.set(line, clean(Buffer.concat(kept)));
  } catch {
    // The report still has line numbers and reasons; the texts are a convenience.
  } finally {
    stream?.destroy();
    raw?.destroy();
  }
  return out;
}
