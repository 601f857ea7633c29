import clsx from "clsx";

/** Shown wherever scores could be read as a judgement on a person, site or account. */
export function Caution({ className, compact = false }: { className?: string; compact?: boolean }) {
  return (
    <aside
      aria-label="How to read these scores"
      className={clsx(
        "flex gap-3 rounded-md border border-amber/50 bg-amber-soft/60 text-[0.8125rem] text-ink-soft",
        compact ? "px-3 py-2" : "px-4 py-3",
        className,
      )}
    >
      <span aria-hidden className="mt-0.5 flex size-4 shrink-0 items-center justify-center rounded-full bg-amber-strong text-[0.625rem] font-bold text-paper">
        !
      </span>
      <p>
        <strong className="font-semibold text-ink">Scores are a signal for human review, not a verdict.</strong>{" "}
        A high or low score says how links flow through this graph, not whether a person, site or account is
        trustworthy. Graphs built from people&apos;s data fall under your local privacy law; keep and share them
        accordingly.
      </p>
    </aside>
  );
}
