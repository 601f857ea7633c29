import clsx from "clsx";
import type { ButtonHTMLAttributes } from "react";

type Variant = "primary" | "secondary" | "quiet" | "danger" | "on-ink";
type Size = "sm" | "md";

const VARIANTS: Record<Variant, string> = {
  primary:
    "bg-amber text-ink-deep border-amber-hover hover:bg-amber-hover shadow-[0_1px_0_var(--color-amber-strong)]",
  secondary: "bg-paper-raised text-ink border-rule-strong hover:bg-paper-sunken",
  quiet: "bg-transparent text-ink-soft border-transparent hover:bg-paper-sunken hover:text-ink",
  danger: "bg-paper-raised text-danger border-rule-strong hover:bg-danger-soft hover:border-danger",
  "on-ink": "bg-transparent text-paper/85 border-ink-line hover:bg-ink-line hover:text-paper",
};

const SIZES: Record<Size, string> = {
  sm: "h-7 px-2.5 text-[0.8125rem] gap-1.5",
  md: "h-9 px-3.5 text-sm gap-2",
};

export type ButtonProps = ButtonHTMLAttributes<HTMLButtonElement> & {
  variant?: Variant;
  size?: Size;
  busy?: boolean;
};

export function buttonClasses(variant: Variant = "secondary", size: Size = "md"): string {
  return clsx(
    "inline-flex shrink-0 items-center justify-center rounded-md border font-medium whitespace-nowrap",
    "transition-colors disabled:cursor-not-allowed disabled:opacity-55",
    VARIANTS[variant],
    SIZES[size],
  );
}

export function Button({
  variant = "secondary",
  size = "md",
  busy = false,
  disabled,
  className,
  children,
  type = "button",
  ...rest
}: ButtonProps) {
  return (
    <button
      type={type}
      disabled={disabled || busy}
      aria-busy={busy || undefined}
      className={clsx(buttonClasses(variant, size), className)}
      {...rest}
    >
      {busy ? <span aria-hidden className="size-3 animate-spin rounded-full border-2 border-current border-r-transparent" /> : null}
      {children}
    </button>
  );
}
