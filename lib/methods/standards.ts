// Calibration standards from pasted spreadsheet cells or an exported file: the delimited parser's own table finder
// (dialect, decimal comma, metadata and header lines above the table) and its number reader, so a pasted table is read
// as an uploaded export is. Pure: used by the calibration workbench in the browser.
import { locateTable } from "@/parsers/delimited/parse";
import { readNumber } from "@/parsers/text";
import { ParseError } from "@/parsers/types";

export interface StandardRow {
  concentration: string;
  absorbance: string;
  replicate: string;
}

/** Rows of concentration, absorbance[, replicate]; each line that is not is named in `problems` with its number. */
export function readStandards(text: string): { rows: StandardRow[]; problems: string[] } {
  let table;
  try {
    table = locateTable(new TextEncoder().encode(text));
  } catch (e) {
    if (e instanceof ParseError) return { rows: [], problems: [e.line ? `Line ${e.line}: ${e.reason}.` : e.message.replace(/\.?$/, ".")] };
    throw e;
  }
  const rows: StandardRow[] = [];
  const problems: string[] = [];
  const num = (cell: string | undefined) => {
    const v = cell === undefined ? NaN : readNumber(cell.trim(), table.decimalComma);
    return v === "partial" ? NaN : v;
  };
  for (let r = 0; r < table.rowCount; r++) {
    const cells = table.row(r).map((c) => c.trim());
    const line = table.first + 1 + r;
    if (cells.every((c) => c === "")) continue;
    const [c, a, rep] = [num(cells[0]), num(cells[1]), num(cells[2])];
    if (Number.isNaN(c) || Number.isNaN(a)) {
      problems.push(`Line ${line}: "${cells.join(" ")}" is not a concentration and an absorbance.`);
      continue;
    }
    const plain = (cell: string) => (table.decimalComma ? cell.replace(",", ".") : cell);
    rows.push({ concentration: plain(cells[0]!), absorbance: plain(cells[1]!), replicate: Number.isNaN(rep) ? "1" : plain(cells[2]!) });
  }
  if (rows.length === 0 && problems.length === 0) problems.push("No rows of numbers found.");
  return { rows, problems };
}
