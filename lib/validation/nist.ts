// NIST StRD reference files (verbatim copies in fixtures/nist, public domain) and NIST's accuracy score.
import fs from "node:fs";
import path from "node:path";

export interface NistDataset {
  name: string;
  kind: "linear" | "nonlinear";
  formula: string;
  nColumns: number;
  paramNames: string[];
  certified: number[];
  certifiedSD: number[];
  residualSumOfSquares: number;
  residualSD?: number;
  degreesOfFreedom: number;
  start1?: number[];
  start2?: number[];
  difficulty: string;
}

export const NIST_DIR = path.resolve("fixtures/nist");

export function nistIndex(dir = NIST_DIR): Record<string, NistDataset> {
  return JSON.parse(fs.readFileSync(path.join(dir, "index.json"), "utf8")).datasets;
}

/** The data block: the rows after the file's last "Data:" header, as columns (y first, then x...). */
export function nistData(name: string, dir = NIST_DIR): number[][] {
  const lines = fs.readFileSync(path.join(dir, `${name}.dat`), "utf8").split(/\r?\n/);
  let start = -1;
  lines.forEach((l, i) => {
    if (/^\s*Data:\s+y\b/.test(l)) start = i + 1;
  });
  const rows = lines
    .slice(start)
    .map((l) => l.trim())
    .filter(Boolean)
    .map((l) => l.split(/\s+/).map(Number));
  const cols = rows[0]!.length;
  return Array.from({ length: cols }, (_, c) => rows.map((r) => r[c]!));
}

/** The NIST formula written for the engine's formula reader: t for x, ^ for **, () for [], atan for arctan. */
export function nistFormulaAsT(f: string): string {
  return f
    .replace(/^.*?y\s*=\s*/, "")
    .replace(/\+\s*e\s*$/, "")
    .replace(/\[/g, "(")
    .replace(/\]/g, ")")
    .replace(/\*\*/g, "^")
    .replace(/arctan/g, "atan")
    .replace(/\bx\b/g, "t")
    .trim();
}

/** Log relative error, as NIST scores accuracy: −log10(|estimate − certified| / |certified|), capped at 15. */
export function lre(estimate: number, certified: number): number {
  if (estimate === certified) return 15;
  const rel = certified === 0 ? Math.abs(estimate) : Math.abs(estimate - certified) / Math.abs(certified);
  return Math.min(15, -Math.log10(rel));
}
