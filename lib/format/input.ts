// Reading what people type into number fields: a decimal comma is accepted, an empty field is "not given".

/** "0,25" or "0.25" → 0.25; "" → null; anything else → NaN (so a form can show it as wrong). */
export function parseDecimalField(text: string): number | null {
  return text.trim() === "" ? null : Number(text.replace(",", "."));
}

/** "k=0.002, b1=1" → { k: 0.002, b1: 1 }; parts that are not name=number are left out (a value may still be NaN). */
export function parseStartValues(text: string): Record<string, number> {
  const out: Record<string, number> = {};
  for (const part of text.split(/[,;]/)) {
    const m = part.match(/^\s*([A-Za-z_]\w*)\s*=\s*([-+0-9.eE]+)\s*$/);
    if (m) out[m[1]!] = Number(m[2]);
  }
  return out;
}

/** The inverse of parseStartValues, for showing saved values in the field. */
export function formatStartValues(values: Record<string, number>): string {
  return Object.entries(values)
    .map(([k, v]) => `${k}=${v}`)
    .join(", ");
}
