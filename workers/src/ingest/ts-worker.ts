// Start a worker thread from a TypeScript module. The entry is a small script that registers the tsx loader inside
// the worker and then imports the module: on Node 20 a worker neither inherits the parent's loader hooks reliably nor
// applies --import hooks to a .ts entry file. Resolved by absolute path, so any working directory will do.

import { createRequire } from "node:module";
import { dirname, join } from "node:path";
import { pathToFileURL } from "node:url";
import { Worker, type WorkerOptions } from "node:worker_threads";

export function startTsWorker(url: URL, options: WorkerOptions = {}): Worker {
  if (!url.pathname.endsWith(".ts")) return new Worker(url, options);
  const tsxDir = dirname(createRequire(import.meta.url).resolve("tsx/package.json"));
  const api = pathToFileURL(join(tsxDir, "dist", "esm", "api", "index.mjs")).href;
  const entry =
    `import(${JSON.stringify(api)})` +
    `.then((tsx) => { tsx.register(); return import(${JSON.stringify(url.href)}); })` +
    `.catch((e) => { process.nextTick(() => { throw e; }); });`;
  return new Worker(entry, { execArgv: [], ...options, eval: true });
}
