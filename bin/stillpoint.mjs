#!/usr/bin/env node
// The TypeScript command line, run from a cached bundle (see cli-bundle.mjs; through the tsx loader when no bundle can
// be made or STILLPOINT_NO_BUNDLE=1) in this process. Started directly rather than through bin/stillpoint, it starts
// Node once more with glibc's malloc asked for transparent huge pages (GLIBC_TUNABLES=glibc.malloc.hugetlb=1, read
// only at process start); signals reach that child and its exit code is ours. STILLPOINT_HUGE_PAGES=0 turns that off.

import { spawn } from "node:child_process";
import { fileURLToPath, pathToFileURL } from "node:url";
import { cliBundle } from "./cli-bundle.mjs";

const env = process.env;
if (env.STILLPOINT_HUGE_PAGES !== "0" && !(env.GLIBC_TUNABLES ?? "").includes("glibc.malloc.hugetlb")) {
  const tunables = [env.GLIBC_TUNABLES, "glibc.malloc.hugetlb=1"].filter(Boolean).join(":");
  const child = spawn(process.execPath, process.argv.slice(1), { stdio: "inherit", env: { ...env, GLIBC_TUNABLES: tunables } });
  for (const signal of ["SIGINT", "SIGTERM", "SIGHUP"]) process.on(signal, () => child.kill(signal));
  child.on("exit", (code, signal) => {
    if (signal) process.kill(process.pid, signal);
    else process.exit(code ?? 1);
  });
} else {
  const entry = fileURLToPath(new URL("../workers/src/cli/main.ts", import.meta.url));
  const bundle = env.STILLPOINT_NO_BUNDLE === "1" ? null : await cliBundle(entry);
  if (bundle) await import(pathToFileURL(bundle).href);
  else {
    const { register } = await import("tsx/esm/api");
    register();
    await import(pathToFileURL(entry).href);
  }
}
