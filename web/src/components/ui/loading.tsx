export function Loading({ label = "Loading…" }: { label?: string }) {
  return (
    <div role="status" aria-live="polite" className="flex items-center gap-2 py-6 text-[0.8125rem] text-ink-muted">
      <span aria-hidden className="size-3.5 animate-spin rounded-full border-2 border-ink-muted border-r-transparent" />
      {label}
    </div>
  );
}
