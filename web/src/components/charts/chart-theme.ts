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

/** Powers of ten covering [min, max] (both > 0): the ticks of a log axis. */
export function decadeTicks(min: number, max: number): number[] {
  if (!(min > 0) || !(max > 0)) return [];
  const lo = Math.floor(Math.log10(Math.min(min, max)));
  const hi = Math.ceil(Math.log10(Math.max(min, max)));
  const ticks: number[] = [];
  for (let e = lo; e <= Math.max(hi, lo + 1); e++) ticks.push(10 ** e);
  return ticks;
}

/** "1e-9", "1e3", "1", "10", "100": short labels for powers of ten. */
export function decadeLabel(value: number): string {
  const e = Math.round(Math.log10(value));
  if (e >= 0 && e <= 3) return String(10 ** e);
  return `1e${e}`;
}
