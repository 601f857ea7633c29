import type { ReactNode } from "react";
import { Button } from "./button";

type PagerProps = {
  label: string;
  page: number;
  hasPrevious: boolean;
  hasNext: boolean;
  onPrevious: () => void;
  onNext: () => void;
  busy?: boolean;
  summary?: ReactNode;
};

export function Pager({ label, page, hasPrevious, hasNext, onPrevious, onNext, busy, summary }: PagerProps) {
  return (
    <nav aria-label={label} className="flex flex-wrap items-center justify-between gap-3 text-[0.8125rem] text-ink-muted">
      <p aria-live="polite">{summary}</p>
      <div className="flex items-center gap-2">
        <Button size="sm" variant="secondary" disabled={!hasPrevious || busy} onClick={onPrevious}>
          Previous
        </Button>
        <span className="num min-w-16 text-center text-ink">Page {page}</span>
        <Button size="sm" variant="secondary" disabled={!hasNext || busy} busy={busy && hasNext} onClick={onNext}>
          Next
        </Button>
      </div>
    </nav>
  );
}
