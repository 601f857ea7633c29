import type { ReactNode } from "react";

/**
 * A chart with a visible caption and a text summary for screen readers; the SVG itself is hidden from them because
 * a list of tick labels says nothing useful.
 */
export function ChartFrame({ title, summary, children, legend }: { title: string; summary: string; children: ReactNode; legend?: ReactNode }) {
  return (
    <figure className="flex flex-col gap-2">
      <figcaption className="flex flex-wrap items-baseline justify-between gap-2">
        <span className="text-[0.8125rem] font-medium text-ink-soft">{title}</span>
        {legend ? <span className="flex flex-wrap gap-3 text-xs text-ink-muted">{legend}</span> : null}
      </figcaption>
      <div aria-hidden>{children}</div>
      <p className="sr-only">{summary}</p>
    </figure>
  );
}

export function LegendKey({ color, label, dashed = false }: { color: string; label: string; dashed?: boolean }) {
  return (
    <span className="inline-flex items-center gap-1.5">
      <svg aria-hidden width="18" height="6">
        <line x1="0" y1="3" x2="18" y2="3" stroke={color} strokeWidth="2" strokeDasharray={dashed ? "4 3" : undefined} />
      </svg>
      {label}
    </span>
  );
}
