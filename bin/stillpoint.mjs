#!/usr/bin/env node
// Launcher for the TypeScript command line. It starts Node once more, on a cached bundle of the command line (see
// cli-bundle.mjs; through the tsx loader when no bundle can be made), with glibc's malloc asked
// for transparent huge pages on large allocations (GLIBC_TUNABLES=glibc.malloc.hugetlb=1; THP mode "madvise" leaves
// plain typed arrays on 4 KiB pages, whose first-touch faults and TLB misses dominate big ingests and gathers).
// STILLPOINT_HUGE_PAGES=0 turns that off. Signals reach the child; its exit code is ours.

import { spawn } from "node:child_process";
import { createRequire } from "node:module";
import { fileURLToPath, pathToFileURL } from "node:url";
import { cliBundle } from "./cli-bundle.mjs";

const entry = fileURLToPath(new URL("../workers/src/cli/main.ts", import.meta.url));
const bundle = process.env.STILLPOINT_NO_BUNDLE === "1" ? null : await cliBundle(entry);
const loader = pathToFileURL(createRequire(import.meta.url).resolve("tsx")).href;
const nodeArgs = bundle ? [bundle] : ["--import", loader, entry];
const env = { ...process.env };
if (env.STILLPOINT_HUGE_PAGES !== "0" && !(env.GLIBC_TUNABLES ?? "").includes("glibc.malloc.hugetlb")) {
  env.GLIBC_TUNABLES = [env.GLIBC_TUNABLES, "glibc.malloc.hugetlb=1"].filter(Boolean).join(":");
}

const child = spawn(process.execPath, [...nodeArgs, ...process.argv.slice(2)], { stdio: "inherit", env });
for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"]) process.on(signal, () => child.kill(signal));
child.on("exit", (code, signal) => {
  if (signal) process.kill(process.pid, signal);
  else process.exit(code ?? 1);
});
