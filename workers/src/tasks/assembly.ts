// The committed WebAssembly modules (workers/assembly/*.wasm), each compiled once per thread that asks for it. Ask on
// the thread that starts the work: worker threads get their modules inside tasks, since their bundles live elsewhere.
import { readFileSync } from "node:fs";
import { setFlagsFromString } from "node:v8";

export type AssemblyName = "pull-step" | "scan-lines" | "order-lists" | "lane-passes" | "score-text";

const compiled = new Map<AssemblyName, WebAssembly.Module>();

export function assemblyFile(name: AssemblyName): URL {
  return new URL(`../../assembly/${name}.wasm`, import.meta.url);
}

export function assemblyModule(name: AssemblyName): WebAssembly.Module {
  let module = compiled.get(name);
  if (!module) {
    // Compiled straight to optimised code: the baseline tier runs a first call about four times slower, and some of
    // these run once per step or once per file (the step kernel, the rank order). They are small: a few ms in all.
    const restore = !process.execArgv.includes("--no-liftoff");
    setFlagsFromString("--no-liftoff");
    try {
      module = new WebAssembly.Module(readFileSync(assemblyFile(name)));
    } finally {
      if (restore) setFlagsFromString("--liftoff");
    }
    compiled.set(name, module);
  }
  return module;
}
