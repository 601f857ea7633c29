// Start a worker thread from a TypeScript module without paying the tsx loader's start-up (about half a second a
// worker here): the module and its imports are bundled once with esbuild (tsx's own dependency) into a cached .mjs,
// reused while none of its input files changed. Without esbuild, the worker registers tsx itself.

import { createHash } from "node:crypto";
import { existsSync, mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from "node:fs";
import { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { fileURLToPath, pathToFileURL } from "node:url";
import { Worker, type WorkerOptions } from "node:worker_threads";

interface Manifest {
  inputs: Array<{ path: string; mtimeMs: number; size: number }>;
}

interface Esbuild {
  buildSync(o: Record<string, unknown>): { metafile?: { inputs: Record<string, unknown> } };
}

const ready = new Map<string, string>();

export function startTsWorker(url: URL, options: WorkerOptions = {}): Worker {
  if (!url.pathname.endsWith(".ts")) return new Worker(url, options);
  const bundle = bundledWorker(url);
  if (bundle) return new Worker(pathToFileURL(bundle), { execArgv: [], ...options });
  const tsxApi = pathToFileURL(join(tsxDir(), "dist", "esm", "api", "index.mjs")).href;
  const entry =
    `import(${JSON.stringify(tsxApi)})` +
    `.then((tsx) => { tsx.register(); return import(${JSON.stringify(url.href)}); })` +
    `.catch((e) => { process.nextTick(() => { throw e; }); });`;
  return new Worker(entry, { execArgv: [], ...options, eval: true });
}

function tsxDir(): string {
  return dirname(createRequire(import.meta.url).resolve("tsx/package.json"));
}

/**
 * Path of an up-to-date bundle of a worker's TypeScript module, or null when esbuild is not available. The bundle
 * lives elsewhere: the module must not resolve files relative to its own import.meta.url.
 */
export function bundledWorker(url: URL): string | null {
  const source = fileURLToPath(url);
  const known = ready.get(source);
  if (known) return known;
  const dir = join(tmpdir(), `stillpoint-workers-${process.getuid?.() ?? 0}`);
  const key = createHash("sha256").update(source).digest("hex").slice(0, 16);
  const out = join(dir, `${key}.mjs`);
  const manifestPath = join(dir, `${key}.json`);
  if (existsSync(out) && fresh(manifestPath)) {
    ready.set(source, out);
    return out;
  }
  let esbuild: Esbuild;
  try {
    esbuild = createRequire(join(tsxDir(), "package.json"))("esbuild") as Esbuild;
  } catch {
    return null;
  }
  mkdirSync(dir, { recursive: true });
  const tmp = `${out}.${process.pid}.tmp`;
  let result: ReturnType<Esbuild["buildSync"]>;
  try {
    result = esbuild.buildSync({
      entryPoints: [source],
      bundle: true,
      platform: "node",
      format: "esm",
      target: "node20",
      outfile: tmp,
      metafile: true,
      absWorkingDir: dirname(source),
      logLevel: "silent",
    });
  } catch {
    return null;
  }
  const inputs = Object.keys(result.metafile?.inputs ?? {}).map((p) => {
    const path = join(dirname(source), p);
    const st = statSync(path);
    return { path, mtimeMs: st.mtimeMs, size: st.size };
  });
  writeFileSync(`${manifestPath}.${process.pid}.tmp`, JSON.stringify({ inputs } satisfies Manifest));
  renameSync(tmp, out);
  renameSync(`${manifestPath}.${process.pid}.tmp`, manifestPath);
  ready.set(source, out);
  return out;
}

function fresh(manifestPath: string): boolean {
  try {
    const m = JSON.parse(readFileSync(manifestPath, "utf8")) as Manifest;
    return m.inputs.every((i) => {
      const st = statSync(i.path);
      return st.mtimeMs === i.mtimeMs && st.size === i.size;
    });
  } catch {
    return false;
  }
}
