// A data table: numbers right-aligned in tabular figures, a caption for screen readers.
import type { ReactNode, TdHTMLAttributes, ThHTMLAttributes } from "react";
import { cn } from "./cn";

export function Table({ caption, children }: { caption: string; children: ReactNode }) {
  return (
    // relative: the screen-reader caption (absolutely positioned) stays inside the scrolling box instead of widening the page.
    <div className="relative overflow-x-auto rounded-cell border border-ink-100 bg-paper-raised">
      <table className="w-full border-collapse text-sm">
        <caption className="sr-only">{caption}</caption>
        {children}
      </table>
    </div>
  );
}

export function Th({ numeric, className, ...rest }: ThHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <th
      scope="col"
      className={cn(
        "border-b border-ink-100 bg-paper-sunk px-3 py-2 text-left text-sm font-semibold text-ink-700",
        numeric && "text-right",
        className,
      )}
      {...rest}
    />
  );
}

export function Td({ numeric, className, ...rest }: TdHTMLAttributes<HTMLTableCellElement> & { numeric?: boolean }) {
  return (
    <td
      className={cn("border-b border-ink-100 px-3 py-2 align-top", numeric && "num whitespace-nowrap text-right font-mono", className)}
      {...rest}
    />
  );
}
