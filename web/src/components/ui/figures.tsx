import clsx from "clsx";
import type { ReactNode } from "react";

export type Figure = { label: string; value: ReactNode; hint?: ReactNode; emphasis?: boolean };

/** A dense grid of labelled figures; values are set in the tabular mono face. */
export function Figures({ items, className, columns = 4 }: { items: Figure[]; className?: string; columns?: 2 | 3 | 4 | 6 }) {
  return (
    <dl
      className={clsx(
        "grid gap-px overflow-hidden rounded-md border border-rule bg-rule",
        { 2: "grid-cols-2", 3: "grid-cols-2 sm:grid-cols-3", 4: "grid-cols-2 md:grid-cols-4", 6: "grid-cols-2 md:grid-cols-3 xl:grid-cols-6" }[columns],
        className,
      )}
    >
      {items.map((item) => (
        <div key={item.label} className="flex min-w-0 flex-col gap-0.5 bg-paper-raised px-3 py-2">
          <dt className="text-xs text-ink-muted">{item.label}</dt>
          <dd className={clsx("num truncate text-ink", item.emphasis ? "text-lg font-medium" : "text-[0.9375rem]")}>{item.value}</dd>
          {item.hint ? <dd className="text-xs text-ink-muted">{item.hint}</dd> : null}
        </div>
      ))}
    </dl>
  );
}

/** Label/value pairs in two columns, for parameters and provenance. */
export function FactList({ items, className }: { items: Array<{ label: string; value: ReactNode }>; className?: string }) {
  return (
    <dl className={clsx("grid grid-cols-[minmax(8rem,max-content)_1fr] gap-x-4 gap-y-1.5 text-[0.8125rem]", className)}>
      {items.map((item) => (
        <div key={item.label} className="contents">
          <dt className="text-ink-muted">{item.label}</dt>
          <dd className="min-w-0 break-words text-ink">{item.value}</dd>
        </div>
      ))}
    </dl>
  );
}
