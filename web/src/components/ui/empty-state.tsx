import clsx from "clsx";
import type { ReactNode } from "react";

type EmptyStateProps = { title: string; children?: ReactNode; action?: ReactNode; className?: string };

export function EmptyState({ title, children, action, className }: EmptyStateProps) {
  return (
    <div
      className={clsx(
        "flex flex-col items-center gap-2 rounded-md border border-dashed border-rule-strong px-6 py-8 text-center",
        className,
      )}
    >
      <p className="font-medium text-ink">{title}</p>
      {children ? <div className="max-w-md text-[0.8125rem] text-ink-muted">{children}</div> : null}
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}
