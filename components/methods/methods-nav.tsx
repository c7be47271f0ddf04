// The two lists of the Methods area, as links (the current one marked).
import Link from "next/link";
import { cn } from "@/components/ui/cn";

export function MethodsNav({ current }: { current: "methods" | "calibrations" }) {
  const item = (href: string, label: string, key: typeof current) => (
    <Link href={href} aria-current={current === key ? "page" : undefined} className={cn("border-b-2 px-1 pb-2 text-sm font-semibold", current === key ? "border-quartz-700 text-quartz-700" : "border-transparent text-ink-700 hover:text-quartz-700")}>
      {label}
    </Link>
  );
  return (
    <nav aria-label="Methods area" className="mb-6 flex gap-6 border-b border-ink-100">
      {item("/methods", "Method templates", "methods")}
      {item("/methods/calibrations", "Calibration curves", "calibrations")}
    </nav>
  );
}
