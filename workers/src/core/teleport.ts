// Teleport vectors, unweighted out-degrees and the per-step scalars that fold in the damping and dangling policy.
import type { StepScalars } from "./pull-step-csr";

export type DanglingPolicy = "teleport" | "uniform";

/**
 * t[v] = Σ weights of seeds naming v / Σ all seed weights (duplicates add up); 0 elsewhere.
 * Throws RangeError for an unknown node, a negative or non-finite weight, or a zero total.
 * @example teleportVector(3, [{ node: 2, weight: 3 }, { node: 0, weight: 1 }]) // [0.25, 0, 0.75]
 */
export function teleportVector(n: number, seeds: readonly { node: number; weight: number }[]): Float64Array {
  const t = new Float64Array(n);
  let total = 0;
  seeds.forEach(({ node, weight }, i) => {
    if (!Number.isInteger(node) || node < 0 || node >= n) {
      throw new RangeError(`seeds[${i}].node must be a dense id in 0..${n - 1}. Value: ${node}`);
    }
    if (!(weight >= 0 && weight < Infinity)) {
      throw new RangeError(`seeds[${i}].weight must be finite and ≥ 0. Value: ${weight}`);
    }
    t[node] += weight;
    total += weight;
  });
  if (!(total > 0)) throw new RangeError(`seed weights must have a positive sum. Value: ${total}`);
  for (let v = 0; v < n; v++) t[v] /= total;
  return t;
}

/**
 * out[u] = number of edges leaving u (each stored in-edge slot counts once), the W_u of an unweighted run.
 * @example outDegree(Uint32Array.of(0, 0, 2), new Float64Array(3)) // [2, 0, 1]
 */
export function outDegree(sources: Uint32Array, out: Float64Array): Float64Array {
  out.fill(0);
  for (let e = 0; e < sources.length; e++) out[sources[e]] += 1;
  return out;
}

/**
 * Scalars for x_{k+1}[v] = α(Σ + D·d[v]) + (1−α)t[v], written as α·Σ + q + p·t[v]:
 * uniform t (and so d = t = 1/n): p = 0, q = (1−α)/n + α·D/n; seeded t with d = t: p = (1−α) + α·D, q = 0;
 * seeded t with uniform d: p = 1−α, q = α·D/n.
 */
export function stepScalars(
  alpha: number,
  danglingMass: number,
  n: number,
  seeded: boolean,
  dangling: DanglingPolicy,
): StepScalars {
  const inv = 1 / n;
  if (!seeded) return { alpha, p: 0, q: (1 - alpha) * inv + alpha * danglingMass * inv };
  if (dangling === "teleport") return { alpha, p: 1 - alpha + alpha * danglingMass, q: 0 };
  return { alpha, p: 1 - alpha, q: alpha * danglingMass * inv };
}
