// The committed WebAssembly modules (workers/assembly/*.wasm), each compiled once per thread that asks for it. Ask on
// the thread that starts the work: worker threads get their modules inside tasks, since their bundles live elsewhere.
import { readFileSync } from "node:fs";

export type AssemblyName = "pull-step" | "scan-lines" | "order-lists" | "lane-passes" | "score-text";

const compiled = new Map<AssemblyName, WebAssembly.Module>();

export function assemblyFile(name: AssemblyName): URL {
  return new URL(`../../assembly/${name}.wasm`, import.meta.url);
}

export function assemblyModule(name: AssemblyName): WebAssembly.Module {
  let module = compiled.get(name);
  if (!module) {
    module = new WebAssembly.Module(readFileSync(assemblyFile(name)));
    compiled.set(name, module);
  }
  return module;
}
