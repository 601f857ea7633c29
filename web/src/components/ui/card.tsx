import clsx from "clsx";
import type { ReactNode } from "react";

type CardProps = {
  title?: ReactNode;
  description?: ReactNode;
  actions?: ReactNode;
  className?: string;
  bodyClassName?: string;
  children: ReactNode;
};

export function Card({ title, description, actions, className, bodyClassName, children }: CardProps) {
  return (
    <section className={clsx("min-w-0 rounded-lg border border-rule bg-paper-raised", className)}>
      {title || actions ? (
        <header className="flex items-start justify-between gap-4 border-b border-rule px-4 py-3">
          <div className="min-w-0">
            {title ? <h2 className="text-[0.9375rem] font-semibold text-ink">{title}</h2> : null}
            {description ? <p className="mt-0.5 text-[0.8125rem] text-ink-muted">{description}</p> : null}
          </div>
          {actions ? <div className="flex shrink-0 items-center gap-2">{actions}</div> : null}
        </header>
      ) : null}
      <div className={clsx("p-4", bodyClassName)}>{children}</div>
    </section>
  );
}
