// Numbers as the trade writes them: a true minus sign, ×10ⁿ for large and small magnitudes, and significant figures
// that follow the uncertainty (two figures of the SE, the value to the same decimal place).

const SUPERSCRIPT: Record<string, string> = { "-": "⁻", "0": "⁰", "1": "¹", "2": "²", "3": "³", "4": "⁴", "5": "⁵", "6": "⁶", "7": "⁷", "8": "⁸", "9": "⁹" };

export function superscript(n: number | string): string {
  return String(n)
    .split("")
    .map((c) => SUPERSCRIPT[c] ?? c)
    .join("");
}

function withMinus(s: string): string {
  return s.replace(/^-/, "−");
}

/** A number to `sig` significant figures, in ×10ⁿ form outside 1e-3 … 1e5. */
export function formatNumber(v: number | null | undefined, sig = 4): string {
  if (v == null || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const e = Math.floor(Math.log10(Math.abs(v)));
  if (e < -3 || e >= 5) {
    const m = v / 10 ** e;
    return `${withMinus(m.toFixed(Math.max(0, sig - 1)))}×10${superscript(e)}`;
  }
  return withMinus(v.toPrecision(sig).replace(/(\.\d*?)0+$/, "$1").replace(/\.$/, ""));
}

/** "4.837(32)×10⁻³"-style is dense; we print "4.837 ± 0.032 ×10⁻³" with a shared exponent. */
export function formatWithUncertainty(value: number | null | undefined, se: number | null | undefined): string {
  if (value == null || !Number.isFinite(value)) return "—";
  if (se == null || !Number.isFinite(se) || se <= 0) return formatNumber(value, 5);
  const e = Math.floor(Math.log10(Math.abs(value) || se));
  const useExp = e < -3 || e >= 5;
  const scale = useExp ? 10 ** e : 1;
  const v = value / scale,
    u = se / scale;
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(u)));
  const body = `${withMinus(v.toFixed(decimals))} ± ${u.toFixed(decimals)}`;
  return useExp ? `(${body})×10${superscript(e)}` : body;
}

export function formatSeconds(s: number | null | undefined): string {
  if (s == null || !Number.isFinite(s)) return "—";
  if (Math.abs(s) < 120) return `${formatNumber(s, 3)} s`;
  if (Math.abs(s) < 7200) return `${formatNumber(s / 60, 3)} min`;
  return `${formatNumber(s / 3600, 3)} h`;
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1048576) return `${(n / 1024).toFixed(1)} KB`;
  return `${(n / 1048576).toFixed(1)} MB`;
}
