import clsx from "clsx";
import type { ReactNode } from "react";

export type Tone = "neutral" | "ink" | "accent" | "ok" | "danger";

const TONES: Record<Tone, string> = {
  neutral: "bg-paper-sunken text-ink-soft border-rule",
  ink: "bg-ink-wash text-ink border-ink-wash",
  accent: "bg-amber-soft text-amber-strong border-amber-soft",
  ok: "bg-ok-soft text-ok border-ok-soft",
  danger: "bg-danger-soft text-danger border-danger-soft",
};

export function Badge({ tone = "neutral", children, className }: { tone?: Tone; children: ReactNode; className?: string }) {
  return (
    <span
      className={clsx(
        "inline-flex h-5 items-center gap-1 rounded-full border px-2 text-xs font-medium whitespace-nowrap",
        TONES[tone],
        className,
      )}
    >
      {children}
    </span>
  );
}

/** A status pill: a dot plus a word, so state never rests on colour alone. */
export function StatusPill({ tone, label }: { tone: Tone; label: string }) {
  return (
    <Badge tone={tone}>
      <span aria-hidden className="size-1.5 rounded-full bg-current" />
      {label}
    </Badge>
  );
}
