// The WebAssembly step kernel inside a worker: one compiled module per thread, one instance per run's memory.
import { checkStep, type StepArgs } from "../core/pull-step";
import { assemblyFile, assemblyModule } from "./assembly";

type WasmPullStep = (
  start: number, end: number, inOffsets: number, sources: number, weights: number, outWeight: number,
  c0: number, x0: number, x1: number, c1: number, alpha: number, p: number, q: number, tel: number,
  blockSums: number, blockNodes: number,
) => void;

export const WASM_FILE = assemblyFile("pull-step");

export function instantiateStep(memory: WebAssembly.Memory, module: WebAssembly.Module = assemblyModule("pull-step")): WasmPullStep {
  const instance = new WebAssembly.Instance(module, { env: { memory } });
  return instance.exports.pullStep as WasmPullStep;
}

/** Checked step on the wasm kernel; every array must be a view into the memory the kernel was instantiated with. */
export function wasmStep(kernel: WasmPullStep, a: StepArgs): void {
  checkStep(a);
  const at = (x: Float64Array | Uint32Array | null) => (x === null ? 0 : x.byteOffset);
  kernel(
    a.start, a.end, at(a.inOffsets), at(a.sources), at(a.weights), at(a.outWeight),
    at(a.c0), at(a.x0), at(a.x1), at(a.c1), a.scalars.alpha, a.scalars.p, a.scalars.q, at(a.tel),
    at(a.blockSums), a.blockNodes,
  );
}
