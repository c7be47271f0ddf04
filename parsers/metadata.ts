// Metadata lines before a table ("key: value", "key;value", "key<TAB>value", "key = value", "# comment"), kept as
// found, with the values every parser recognises: wavelength_nm, path_length_cm, temperature_c, operator, sample, and
// the time unit.
import { timeUnitFactor, toCelsius, toCentimetres } from "@/lib/units";

export interface MetadataResult {
  metadata: Record<string, string | number>;
  timeUnit?: { name: string; factor: number; line: number };
  declaredEncoding?: { name: string; line: number };
  comments: string[];
}

/** "24,6 °C" → { value: 24.6, unit: "°C" }; decimal comma understood. */
export function numberWithUnit(text: string): { value: number; unit: string } | null {
  const m = text.trim().match(/^([+-]?(?:\d+(?:[.,]\d*)?|[.,]\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/);
  if (!m) return null;
  const value = Number(m[1]!.replace(",", "."));
  return Number.isFinite(value) ? { value, unit: m[2]!.trim() } : null;
}

export function splitMetadataLine(line: string): [string, string] | null {
  const m = line.match(/^\s*([^:;=\t]+?)\s*(?::|;|=|\t)\s*(.*?)\s*[;,\t]*$/);
  if (!m || !m[1]) return null;
  return [m[1].trim(), m[2]!.trim()];
}

export function readMetadata(lines: ReadonlyArray<{ text: string; line: number }>): MetadataResult {
  const metadata: Record<string, string | number> = {};
  const comments: string[] = [];
  const out: MetadataResult = { metadata, comments };
  for (const { text, line } of lines) {
    const t = text.trim();
    if (!t) continue;
    if (t.startsWith("#") || t.startsWith("//") || t.startsWith(";")) {
      const c = t.replace(/^(#+|\/\/|;+)\s*/, "");
      const kv = splitMetadataLine(c);
      if (kv && kv[1]) addKey(out, kv[0], kv[1], line);
      else if (c) comments.push(c);
      continue;
    }
    const kv = splitMetadataLine(t);
    if (kv) addKey(out, kv[0], kv[1], line);
    else comments.push(t);
  }
  if (comments.length) metadata.comments = comments.join("\n");
  return out;
}

function addKey(out: MetadataResult, key: string, value: string, line: number): void {
  out.metadata[key] = value;
  const k = key.toLowerCase();
  const num = numberWithUnit(value);
  if (/wave\s*length|lambda|^λ|^wl\b/.test(k) && num) {
    out.metadata.wavelength_nm = num.value;
  } else if (/path\s*length|optical path|cell length|cuvette length|^path\b/.test(k) && num) {
    out.metadata.path_length_cm = toCentimetres(num.value, num.unit || (k.includes("(mm)") ? "mm" : "cm"));
  } else if (/^temp|temperature/.test(k) && num) {
    const unit = num.unit || (k.match(/\((°?[ckf])\)/i)?.[1] ?? "");
    out.metadata.temperature_c = toCelsius(num.value, unit);
  } else if (/^time\s*unit|^time\s*base|^x\s*unit/.test(k)) {
    const factor = timeUnitFactor(value);
    if (factor) out.timeUnit = { name: value, factor, line };
  } else if (/^(operator|analyst|operator name|measured by|user name)$/.test(k) && value) {
    out.metadata.operator = value.slice(0, 120);
  } else if (/^(sample|sample id|sample name|sample\/lot|lot|lot no\.?|batch)$/.test(k) && value) {
    out.metadata.sample = value.slice(0, 120);
  } else if (/^encoding|charset|character set/.test(k)) {
    out.declaredEncoding = { name: value, line };
  }
}
