/**
 * How far a run has come, 0..1: the share of the way from the first residual down to the tolerance on a log scale,
 * or k / cap when that is further (a run that stalls still fills its bar by the cap).
 */
export function runProgress(firstResidual: number | null, lastResidual: number | null, tolerance: number, k: number, cap: number): number {
  const byCap = cap > 0 ? k / cap : 0;
  if (!firstResidual || !lastResidual || firstResidual <= tolerance) return Math.min(1, byCap);
  const byResidual = Math.log(firstResidual / lastResidual) / Math.log(firstResidual / tolerance);
  return Math.min(1, Math.max(0, byResidual, byCap));
}
