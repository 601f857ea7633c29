import type { RunProgress } from "../../../contracts/runs";

export interface IterationSample {
  k: number;
  residual: number;
  elapsedMs: number;
}

const RATE_WINDOW = 10;

/**
 * Live figures from the recent iterations. Rate ρ = geometric mean of r_k / r_{k−1} over the window; iterations
 * left = ⌈log(τ / r_last) / log ρ⌉ when 0 < ρ < 1 and r_last > τ.
 */
export function runProgress(
  recent: readonly IterationSample[],
  totals: { count: number; totalMs: number },
  edges: number | null,
  tolerance: number,
  active: boolean,
): RunProgress {
  const perIterationMs = totals.count > 0 ? totals.totalMs / totals.count : null;
  const edgesPerSecond = perIterationMs && edges !== null && perIterationMs > 0 ? (edges / perIterationMs) * 1000 : null;
  const window = recent.slice(-RATE_WINDOW - 1);
  let logSum = 0;
  let steps = 0;
  for (let i = 1; i < window.length; i++) {
    const prev = window[i - 1].residual;
    const cur = window[i].residual;
    if (window[i].k === window[i - 1].k + 1 && prev > 0 && cur > 0) {
      logSum += Math.log(cur / prev);
      steps++;
    }
  }
  const contractionRate = steps > 0 ? Math.exp(logSum / steps) : null;
  const last = recent.at(-1)?.residual ?? null;
  let iterationsLeft: number | null = null;
  if (active && contractionRate !== null && contractionRate > 0 && contractionRate < 1 && last !== null) {
    iterationsLeft = last <= tolerance ? 0 : Math.ceil(Math.log(tolerance / last) / Math.log(contractionRate));
  }
  const etaSeconds = iterationsLeft !== null && perIterationMs !== null ? (iterationsLeft * perIterationMs) / 1000 : null;
  return { perIterationMs, edgesPerSecond, contractionRate, iterationsLeft, etaSeconds };
}

/** Certified bound on ‖x − π‖₁ from a residual: α/(1−α)·r. */
export function errorBoundOf(damping: number, residual: number): number {
  return (damping / (1 - damping)) * residual;
}
