import clsx from "clsx";
import type { HTMLAttributes, ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";

// relative: screen-reader-only text inside cells is absolutely positioned; without a positioned wrapper it escapes the
// scroll box of a wide table and widens the whole page.
export function Table({ caption, children, className }: { caption: string; children: ReactNode; className?: string }) {
  return (
    <div className={clsx("relative overflow-x-auto", className)}>
      <table className="w-full border-collapse text-left text-sm">
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function THead({ children }: { children: ReactNode }) {
  return <thead className="border-b border-rule-strong">{children}</thead>;
}

export function TBody({ children }: { children: ReactNode }) {
  return <tbody className="divide-y divide-rule">{children}</tbody>;
}

export function TR({ className, ...rest }: HTMLAttributes<HTMLTableRowElement>) {
  return <tr className={clsx("align-middle", className)} {...rest} />;
}

type CellExtras = { numeric?: boolean };

export function TH({ numeric, className, ...rest }: ThHTMLAttributes<HTMLTableCellElement> & CellExtras) {
  return (
    <th
      scope="col"
      className={clsx(
        "px-3 py-2 text-xs font-semibold tracking-wide text-ink-muted uppercase first:pl-4 last:pr-4",
        numeric && "text-right",
        className,
      )}
      {...rest}
    />
  );
}

export function TD({ numeric, className, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & CellExtras) {
  return (
    <td
      className={clsx("px-3 py-1.5 text-ink first:pl-4 last:pr-4", numeric && "num text-right", className)}
      {...rest}
    />
  );
}
