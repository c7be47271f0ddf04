import type { ButtonHTMLAttributes } from "react";
import { cn } from "./cn";

const VARIANTS = {
  primary: "bg-quartz-700 text-white hover:bg-quartz-600 disabled:bg-ink-300",
  secondary: "bg-paper-raised text-ink-900 border border-ink-300 hover:border-ink-500 disabled:text-ink-300",
  quiet: "bg-transparent text-quartz-700 hover:bg-quartz-100 disabled:text-ink-300",
  danger: "bg-fault-700 text-white hover:opacity-90 disabled:bg-ink-300",
} as const;

const SIZES = { sm: "h-8 px-3 text-sm", md: "h-10 px-4 text-base" } as const;

export interface ButtonProps extends ButtonHTMLAttributes<HTMLButtonElement> {
  variant?: keyof typeof VARIANTS;
  size?: keyof typeof SIZES;
}

export function Button({ variant = "primary", size = "md", className, type = "button", ...rest }: ButtonProps) {
  return (
    <button
      type={type}
      className={cn(
        "inline-flex items-center justify-center gap-2 rounded-cell font-semibold transition-colors disabled:cursor-not-allowed",
        VARIANTS[variant],
        SIZES[size],
        className,
      )}
      {...rest}
    />
  );
}

/** The class of a link that looks like a button (downloads, "open"): the same variants and sizes as Button. */
export function buttonLinkClass(variant: keyof typeof VARIANTS = "secondary", size: keyof typeof SIZES = "md", className?: string): string {
  return cn("inline-flex items-center justify-center gap-2 rounded-cell font-semibold transition-colors", VARIANTS[variant], SIZES[size], className);
}
