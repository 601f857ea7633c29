/**
 * Which ranks are certain under an L1 error bound ε: every |x_i − π_i| ≤ ‖x − π‖₁ ≤ ε, so two nodes can swap only
 * when their scores are within 2ε. Position i (scores descending) is certain when the gaps to both neighbours exceed
 * 2ε. `next` is the score just below the last position (null when the list holds every node).
 */
export function certainPositions(scores: ArrayLike<number>, errorBound: number | null, next: number | null | undefined): boolean[] {
  const n = scores.length;
  const out = new Array<boolean>(n).fill(false);
  if (errorBound === null || !Number.isFinite(errorBound)) return out;
  const gap = 2 * errorBound;
  for (let i = 0; i < n; i++) {
    const aboveOk = i === 0 || scores[i - 1] - scores[i] > gap;
    const below = i + 1 < n ? scores[i + 1] : next;
    // An unknown neighbour below (undefined) leaves the position uncertain; none at all (null) is no risk.
    const belowOk = below === null ? true : below === undefined ? false : scores[i] - below > gap;
    out[i] = aboveOk && belowOk;
  }
  return out;
}

export function certainPrefix(certain: readonly boolean[]): number {
  const first = certain.indexOf(false);
  return first < 0 ? certain.length : first;
}
