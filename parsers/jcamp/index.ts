// JCAMP-DX time series: a data table whose X is time (##XUNITS= SECONDS, MINUTES or HOURS) and whose Y is
// absorbance, transmittance or another signal.
import { percentTToAbsorbance, timeUnitFactor, type Quantity } from "@/lib/units";
import { numberWithUnit } from "../metadata";
import { decodeText } from "../text";
import { ParseError, type ExportParser, type ParsedExport } from "../types";
import { decodeJcamp } from "./decode";

export { decodeJcamp } from "./decode";

function parseJcamp(bytes: Uint8Array): ParsedExport {
  const { text, warnings: decodeWarnings } = decodeText(bytes);
  const d = decodeJcamp(text);
  const warnings = [...decodeWarnings, ...d.warnings];
  const xUnits = d.labels.XUNITS ?? "";
  const factor = timeUnitFactor(xUnits.replace(/^TIME\s*\(?|\)$/gi, "").trim() || xUnits);
  if (factor === null)
    throw new ParseError(`##XUNITS= is "${xUnits || "missing"}": this table is not a time series (a spectrum, perhaps), so it has no kinetics to read`, d.labelLines.XUNITS ?? d.labelLines.XYDATA ?? d.labelLines.XYPOINTS);
  const yUnits = (d.labels.YUNITS ?? "").toUpperCase();
  let quantity: Quantity = "signal";
  let unit = d.labels.YUNITS ?? "";
  let convert: (v: number) => number = (v) => v;
  if (/ABSORBANCE/.test(yUnits)) {
    quantity = "absorbance";
    unit = "AU";
  } else if (/TRANSMITTANCE/.test(yUnits)) {
    quantity = "transmittance-converted absorbance";
    unit = "AU";
    const percent = /%|PERCENT/.test(yUnits);
    convert = percent ? (v) => (v > 0 ? percentTToAbsorbance(v) : NaN) : (v) => (v > 0 ? -Math.log10(v) : NaN);
  } else if (/MOL|CONC/.test(yUnits)) {
    quantity = "concentration";
  }
  const t: number[] = [],
    y: number[] = [],
    skipped: number[] = [];
  let prev = -Infinity;
  for (let i = 0; i < d.x.length; i++) {
    const ti = d.x[i]! * factor;
    if (ti < prev) throw new ParseError(`the time goes backwards (X = ${d.x[i]} after ${d.x[i - 1]})`, d.lines[i]);
    prev = ti;
    const v = convert(d.y[i]!);
    if (Number.isNaN(v)) skipped.push(d.lines[i]!);
    else {
      t.push(ti);
      y.push(v);
    }
  }
  if (y.length === 0) throw new ParseError("the data table holds no numbers", d.labelLines.XYDATA ?? d.labelLines.XYPOINTS);
  if (skipped.length) warnings.push(`${skipped.length} missing or unusable reading(s) skipped.`);
  const metadata: Record<string, string | number> = {};
  for (const [k, v] of Object.entries(d.labels)) metadata[k] = v;
  const num = (k: string) => (d.labels[k] !== undefined ? numberWithUnit(d.labels[k]!) : null);
  const wl = num(".OBSERVEWAVELENGTH") ?? num("WAVELENGTH") ?? num("$WAVELENGTH");
  if (wl) metadata.wavelength_nm = wl.value;
  const pl = num("PATHLENGTH");
  if (pl) metadata.path_length_cm = /mm/i.test(pl.unit) ? pl.value / 10 : pl.value;
  const temp = num("TEMPERATURE");
  if (temp) metadata.temperature_c = /^K/i.test(temp.unit) ? temp.value - 273.15 : temp.value;
  return {
    parser: "jcamp-dx",
    metadata,
    series: [{ name: d.labels.TITLE || "Series 1", quantity, unit, t, y, skipped_lines: skipped }],
    warnings,
  };
}

export const jcampParser: ExportParser = {
  name: "jcamp-dx",
  sniff(bytes, fileName) {
    const head = new TextDecoder("latin1").decode(bytes.subarray(0, 2048));
    if (/^\s*##TITLE\s*=/im.test(head) && /##JCAMP[-\s]?DX\s*=/i.test(head)) return 0.95;
    if (/\.(jdx|dx|jcamp)$/i.test(fileName)) return 0.7;
    return 0;
  },
  parse(bytes) {
    try {
      return parseJcamp(bytes);
    } catch (e) {
      if (e instanceof ParseError) return e;
      throw e;
    }
  },
};
