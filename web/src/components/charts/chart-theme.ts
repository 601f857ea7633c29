// Chart colours come from the design tokens so the charts sit in the same palette as the rest of the portal.
export const CHART = {
  ink: "var(--color-ink)",
  inkSoft: "var(--color-ink-soft)",
  muted: "var(--color-ink-muted)",
  amber: "var(--color-amber)",
  amberStrong: "var(--color-amber-strong)",
  grid: "var(--color-rule)",
  ok: "var(--color-ok)",
  danger: "var(--color-danger)",
  font: { fontSize: 11, fontFamily: "var(--font-mono)", fill: "var(--color-ink-muted)" },
} as const;

/** Powers of ten covering [min, max] (both > 0): the ticks of a log axis, every few decades when the span is wide. */
export function decadeTicks(min: number, max: number, most = 12): number[] {
  if (!(min > 0) || !(max > 0)) return [];
  const hi = Math.ceil(Math.log10(Math.max(min, max)));
  let lo = Math.min(Math.floor(Math.log10(Math.min(min, max))), hi - 1);
  const step = Math.ceil((hi - lo) / (most - 1));
  lo = hi - step * Math.ceil((hi - lo) / step);
  const ticks: number[] = [];
  for (let e = lo; e <= hi; e += step) ticks.push(10 ** e);
  return ticks;
}

/** "1e-9", "1e3", "1", "10", "100": short labels for powers of ten. */
export function decadeLabel(value: number): string {
  const e = Math.round(Math.log10(value));
  if (e >= 0 && e <= 3) return String(10 ** e);
  return `1e${e}`;
}

/** About `count` round ticks (steps of 1, 2 or 5 × 10^n) from 0 up to at least `max`. */
export function niceTicks(max: number, count = 6): number[] {
  if (!(max > 0)) return [0, 1];
  const raw = max / count;
  const magnitude = 10 ** Math.floor(Math.log10(raw));
  const step = ([1, 2, 5, 10].find((m) => m * magnitude >= raw) ?? 10) * magnitude;
  const ticks: number[] = [];
  for (let t = 0; t < max + step; t += step) ticks.push(t);
  return ticks;
}
