import type { ReactNode } from "react";

export function EmptyState({ title, children, action }: { title: string; children?: ReactNode; action?: ReactNode }) {
  return (
    <div className="flex flex-col items-center gap-2 rounded-md border border-dashed border-rule-strong px-6 py-8 text-center">
      <p className="font-medium text-ink">{title}</p>
      {children ? <div className="max-w-md text-[0.8125rem] text-ink-muted">{children}</div> : null}
      {action ? <div className="mt-2">{action}</div> : null}
    </div>
  );
}
