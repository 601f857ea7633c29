// Deterministic R-MAT edge lists for the benchmark: m = edgeFactor · 2^scale directed edges over ids [0, 2^scale).
// Each edge descends `scale` levels of the 2×2 initiator (a, b, c, d = 1−a−b−c), one 16-bit draw per level from a
// xoshiro128** stream with a fixed seed; ids then go through a fixed bijection on `scale` bits so that the hubs are
// not the small ids. Duplicates and self-loops are kept. Text "src\tdst\n", written straight from bytes.

import { createWriteStream, existsSync, mkdirSync, renameSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";

export interface RmatSpec {
  scale: number;
  edgeFactor: number;
  a: number;
  b: number;
  c: number;
  seed: number;
}

export const DEFAULT_RMAT: Omit<RmatSpec, "scale"> = { edgeFactor: 16, a: 0.57, b: 0.19, c: 0.19, seed: 0x5eed };

class Xoshiro128 {
  private s = new Uint32Array(4);
  constructor(seed: number) {
    let x = seed >>> 0 || 1;
    for (let i = 0; i < 4; i++) {
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b);
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35);
      this.s[i] = (z ^ (z >>> 16)) >>> 0 || 1;
    }
  }
  next(): number {
    const s = this.s;
    const r = Math.imul(rotl(Math.imul(s[1], 5), 7), 9) >>> 0;
    const t = s[1] << 9;
    s[2] ^= s[0];
    s[3] ^= s[1];
    s[1] ^= s[2];
    s[0] ^= s[3];
    s[2] ^= t;
    s[3] = rotl(s[3], 11);
    return r;
  }
}

function rotl(x: number, k: number): number {
  return (x << k) | (x >>> (32 - k));
}

/** A bijection on [0, 2^bits): odd multiplications and xor-shifts, all modulo 2^bits. */
function scramble(x: number, bits: number, mask: number): number {
  x = Math.imul(x, 0x2c9277b5) & mask;
  x ^= x >>> (bits >>> 1) || 0;
  x = Math.imul(x, 0x5a0fd4c3) & mask;
  x ^= x >>> ((bits + 1) >>> 1) || 0;
  return x >>> 0;
}

/** Write the edge list to `path` (via a temporary file). */
export async function writeRmat(path: string, spec: RmatSpec): Promise<void> {
  const { scale, edgeFactor, a, b, c } = spec;
  if (scale < 2 || scale > 31) throw new RangeError(`scale must be in 2..31. Value: ${scale}`);
  const m = edgeFactor * 2 ** scale;
  const ta = Math.round(a * 65536);
  const tb = Math.round((a + b) * 65536);
  const tc = Math.round((a + b + c) * 65536);
  const mask = scale === 31 ? 0x7fffffff : (1 << scale) - 1;
  const rng = new Xoshiro128(spec.seed);
  const tmp = `${path}.${process.pid}.tmp`;
  const out = createWriteStream(tmp);
  const CHUNK = 1 << 22;
  let buf = Buffer.allocUnsafe(CHUNK + 64);
  let at = 0;
  const digits = new Uint8Array(12);
  const put = (v: number) => {
    let k = 0;
    do {
      digits[k++] = 48 + (v % 10);
      v = Math.floor(v / 10);
    } while (v > 0);
    while (k > 0) buf[at++] = digits[--k];
  };
  for (let e = 0; e < m; e++) {
    let u = 0;
    let v = 0;
    let r = 0;
    for (let level = 0; level < scale; level++) {
      if ((level & 1) === 0) r = rng.next();
      const q = (level & 1) === 0 ? r & 0xffff : r >>> 16;
      const bit = 1 << (scale - 1 - level);
      if (q >= ta) {
        if (q < tb) v |= bit;
        else if (q < tc) u |= bit;
        else {
          u |= bit;
          v |= bit;
        }
      }
    }
    put(scramble(u, scale, mask));
    buf[at++] = 9;
    put(scramble(v, scale, mask));
    buf[at++] = 10;
    if (at >= CHUNK) {
      const full = buf.subarray(0, at);
      if (!out.write(full)) await new Promise<void>((r) => out.once("drain", () => r()));
      buf = Buffer.allocUnsafe(CHUNK + 64);
      at = 0;
    }
  }
  out.write(buf.subarray(0, at));
  await new Promise<void>((resolve, reject) => out.end((err?: Error | null) => (err ? reject(err) : resolve())));
  renameSync(tmp, path);
}

/** The cached edge list for a scale (generated on first use). */
export async function rmatFile(scale: number, dir = join(tmpdir(), "stillpoint-bench")): Promise<string> {
  const spec: RmatSpec = { scale, ...DEFAULT_RMAT };
  mkdirSync(dir, { recursive: true });
  const path = join(dir, `rmat-s${scale}-e${spec.edgeFactor}-seed${spec.seed}.tsv`);
  if (!existsSync(path)) await writeRmat(path, spec);
  return path;
}
