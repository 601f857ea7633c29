import type { ReactNode } from "react";

/** An honest placeholder for a screen whose API is not built yet. */
export function ComingSoon({ what, children }: { what: string; children?: ReactNode }) {
  return (
    <div className="rounded-lg border border-dashed border-rule-strong bg-paper-raised/60 px-6 py-10">
      <p className="text-xs font-semibold tracking-wider text-amber-strong uppercase">Not built yet</p>
      <p className="mt-1 text-base font-semibold text-ink">{what}</p>
      <div className="mt-2 max-w-xl text-[0.8125rem] text-ink-muted">{children}</div>
    </div>
  );
}
