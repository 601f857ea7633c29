import clsx from "clsx";
import type { ReactNode } from "react";
import { ApiError, getErrorMessage } from "../../lib/api-client";

type ErrorBannerProps = {
  error: unknown;
  title?: string;
  action?: ReactNode;
  className?: string;
};

/** Shows the API's own message; role="alert" makes screen readers announce it as it appears. */
export function ErrorBanner({ error, title, action, className }: ErrorBannerProps) {
  const code = error instanceof ApiError ? error.code : null;
  return (
    <div
      role="alert"
      className={clsx(
        "flex items-start justify-between gap-3 rounded-md border border-danger/40 bg-danger-soft px-3 py-2.5 text-sm text-danger",
        className,
      )}
    >
      <div className="min-w-0">
        {title ? <p className="font-semibold">{title}</p> : null}
        <p className="break-words">{getErrorMessage(error)}</p>
        {code ? <p className="num mt-0.5 text-xs opacity-80">{code}</p> : null}
      </div>
      {action}
    </div>
  );
}

export function Notice({ children, className }: { children: ReactNode; className?: string }) {
  return (
    <div role="status" className={clsx("rounded-md border border-ok/30 bg-ok-soft px-3 py-2.5 text-sm text-ok", className)}>
      {children}
    </div>
  );
}
