import type { ReactNode } from "react";
import { Wordmark } from "../ui/wordmark";

type AuthLayoutProps = { title: string; description?: ReactNode; children: ReactNode; footer?: ReactNode };

export function AuthLayout({ title, description, children, footer }: AuthLayoutProps) {
  return (
    <div className="flex min-h-screen flex-col items-center justify-center px-4 py-12">
      <div className="w-full max-w-sm">
        <div className="mb-6 flex flex-col items-center gap-1 text-center">
          <Wordmark />
          <p className="text-xs text-ink-muted">Importance scores for large directed graphs</p>
        </div>
        <main className="rounded-lg border border-rule bg-paper-raised px-6 py-6 shadow-[0_1px_2px_rgba(27,40,66,0.06)]">
          <h1 className="text-lg font-semibold tracking-tight text-ink">{title}</h1>
          {description ? <p className="mt-1 text-[0.8125rem] text-ink-muted">{description}</p> : null}
          <div className="mt-5">{children}</div>
        </main>
        {footer ? <div className="mt-4 text-center text-[0.8125rem] text-ink-muted">{footer}</div> : null}
      </div>
    </div>
  );
}
