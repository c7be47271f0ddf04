// `npm run --silent cli -- <verb> FILE [options]`: the command-line contract (../shared/contracts/CLI.md), through the
// same parsers and engine as the web app.
import fs from "node:fs";
import path from "node:path";
import { parseArgs } from "node:util";
import { arrhenius, celsiusToKelvin, ENGINE_VERSION, fitGlobal, fitKinetics, FitSpecError, GlobalFitError, MODEL_NAMES, TemperatureDataError, type FitResult, type GlobalFitResult, type GlobalRun, type RatePoint } from "@/lib/kinetics";
import { parseExport, ParseError, type ParsedExport } from "@/parsers";
import { locateTable } from "@/parsers/delimited/parse";
import { readNumber } from "@/parsers/text";

const USAGE = `Usage: npm run --silent cli -- <verb> FILE [options]

  parse FILE --json                         read an export through the parsers
  ingest FILE [--lab SLUG] [--json]         store an export in DATABASE_FILE
  setup --lab NAME --slug SLUG --admin-email EMAIL --admin-name NAME [--json]
                                            a new lab and its first administrator (password from
                                            HALFLIGHT_ADMIN_PASSWORD or standard input)
  fit FILE [--series NAME] (--model NAME | --formula EXPR) [--fix P=V]... [--start P=V]...
           [--interval SECONDS] --json      fit a kinetic model (time in seconds)
  arrhenius FILE --json                     activation energy and Eyring parameters
  global FILE... --model NAME (--arrhenius [--tref C] | --shared P[,P...]) --json
                                            fit every file's first series at once, some parameters shared
  validate [--json] [--reference DIR]       the built-in validation run (exit 1 if a case fails)

Models: ${MODEL_NAMES.join(", ")}
`;

export class CliError extends Error {
  constructor(
    message: string,
    readonly exitCode = 1,
  ) {
    super(message);
  }
}

function readFileBytes(file: string | undefined): Uint8Array {
  if (!file) throw new CliError("no FILE given.\n\n" + USAGE, 2);
  try {
    return new Uint8Array(fs.readFileSync(file));
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new CliError(`${file}: ${code === "ENOENT" ? "no such file" : code === "EISDIR" ? "is a folder, not a file" : "cannot be read"}.`);
  }
}

function parseFile(file: string): ParsedExport {
  const res = parseExport(readFileBytes(file), path.basename(file));
  if (res instanceof ParseError) throw new CliError(`${file}: ${res.message}`);
  return res;
}

function pairs(list: string[] | undefined, flag: string): Record<string, number> {
  const out: Record<string, number> = {};
  for (const item of list ?? []) {
    const m = item.match(/^\s*([A-Za-z_]\w*)\s*=\s*(.+?)\s*$/);
    const v = m ? Number(m[2]) : NaN;
    if (!m || !Number.isFinite(v)) throw new CliError(`${flag} ${item}: write it as NAME=NUMBER (for example ${flag} ainf=0.04).`, 2);
    out[m[1]!] = v;
  }
  return out;
}

export function seriesForCli(p: ParsedExport) {
  return {
    parser: p.parser,
    metadata: p.metadata,
    series: p.series.map((s) => ({
      name: s.name,
      quantity: s.quantity === "transmittance-converted absorbance" ? "absorbance" : s.quantity,
      ...(s.quantity === "transmittance-converted absorbance" ? { converted_from: "%T" } : {}),
      unit: s.unit,
      // Plain arrays in the JSON (the byte-level reader hands over Float64Arrays, which JSON writes as objects).
      t: Array.from(s.t),
      y: Array.from(s.y),
      skipped_lines: s.skipped_lines,
      ...(s.metadata ? { metadata: s.metadata } : {}),
    })),
    warnings: p.warnings,
  };
}

export function fitForCli(r: FitResult, series: string) {
  const { residuals: _r, fitted: _f, line_x: _x, ...rest } = r;
  return { ...rest, series, engine: ENGINE_VERSION };
}

function cmdFit(argv: string[]): unknown {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: {
      series: { type: "string" },
      model: { type: "string" },
      formula: { type: "string" },
      fix: { type: "string", multiple: true },
      start: { type: "string", multiple: true },
      interval: { type: "string" },
      json: { type: "boolean" },
      "log-weights": { type: "boolean" },
    },
  });
  const file = positionals[0];
  if (values.model && values.formula) throw new CliError("give --model or --formula, not both.", 2);
  const parsed = parseFile(file ?? (readFileBytes(undefined) as never));
  const s = values.series ? parsed.series.find((x) => x.name === values.series) : parsed.series[0];
  if (!s) throw new CliError(`${file}: there is no series "${values.series}" (series: ${parsed.series.map((x) => `"${x.name}"`).join(", ")}).`);
  const interval = values.interval === undefined ? undefined : Number(values.interval);
  if (interval !== undefined && !(interval > 0)) throw new CliError(`--interval ${values.interval}: give a positive number of seconds.`, 2);
  try {
    const r = fitKinetics(s.t, s.y, {
      model: values.formula ? undefined : (values.model ?? "first-order"),
      formula: values.formula,
      fixed: pairs(values.fix, "--fix"),
      start: values.start ? pairs(values.start, "--start") : undefined,
      interval,
      logWeights: values["log-weights"],
    });
    return fitForCli(r, s.name);
  } catch (e) {
    if (e instanceof FitSpecError) throw new CliError(e.message, 2);
    throw e;
  }
}

/** Reads a table of temperatures (°C or K in the header), rate constants and optional standard errors. */
export function readRateTable(bytes: Uint8Array, file: string): RatePoint[] {
  let table;
  try {
    table = locateTable(bytes);
  } catch (e) {
    if (e instanceof ParseError) throw new CliError(`${file}: ${e.message}`);
    throw e;
  }
  const h = table.headerCells;
  const headerLine = table.headerIdx + 1;
  const tCol = h.findIndex((x) => /°\s*C|\(\s*C\s*\)|\bdeg\s*C|celsius|\(\s*K\s*\)|\bkelvin|\[\s*K\s*\]|\/\s*K\b|°\s*K/i.test(x));
  if (tCol < 0) throw new CliError(`${file}: line ${headerLine || 1}: no temperature column: put °C or K in its header, e.g. "T (°C)".`);
  const kelvin = !/°\s*C|\(\s*C\s*\)|deg\s*C|celsius/i.test(h[tCol]!);
  const seCol = h.findIndex((x, i) => i !== tCol && /^(se|s\.e\.|sd|std|stderr|standard error|error|u\(|σ|sigma)/i.test(x.trim()));
  let kCol = h.findIndex((x, i) => i !== tCol && i !== seCol && /^(k|kobs|k_obs|rate)/i.test(x.trim()));
  if (kCol < 0) kCol = h.findIndex((_, i) => i !== tCol && i !== seCol);
  if (kCol < 0) throw new CliError(`${file}: line ${headerLine || 1}: no rate-constant column beside the temperature.`);
  const points: RatePoint[] = [];
  for (let r = 0; r < table.rowCount; r++) {
    const cells = table.row(r);
    const line = table.first + 1 + r;
    if (cells.length === 1 && !cells[0]!.trim()) continue;
    const num = (c: number, what: string, optional = false): number | null => {
      const raw = (cells[c] ?? "").trim();
      if (optional && raw === "") return null;
      const v = readNumber(raw, table.decimalComma);
      if (typeof v !== "number" || Number.isNaN(v)) throw new CliError(`${file}: line ${line}: the ${what} "${raw}" is not a number.`);
      return v;
    };
    const T = num(tCol, "temperature")!;
    points.push({
      temperatureK: kelvin ? T : celsiusToKelvin(T),
      k: num(kCol, "rate constant")!,
      se: seCol >= 0 ? num(seCol, "standard error", true) : null,
    });
  }
  return points;
}

function cmdArrhenius(argv: string[]): unknown {
  const { positionals } = parseArgs({ args: argv, allowPositionals: true, options: { json: { type: "boolean" } } });
  const file = positionals[0];
  const points = readRateTable(readFileBytes(file), file!);
  try {
    const a = arrhenius(points);
    return {
      n: a.n,
      method: a.method,
      weighted: a.weighted,
      ea: a.ea,
      lnA: a.lnA,
      corr_ea_lnA: a.corrEaLnA,
      r2: a.r2,
      dof: a.dof,
      eyring: a.eyring,
      temperature_range_k: a.temperatureRangeK,
      warnings: a.warnings,
      engine: ENGINE_VERSION,
    };
  } catch (e) {
    if (e instanceof TemperatureDataError) throw new CliError(`${file}: ${e.message}`);
    throw e;
  }
}

function cmdGlobal(argv: string[]): unknown {
  const { values, positionals } = parseArgs({
    args: argv,
    allowPositionals: true,
    options: { model: { type: "string" }, arrhenius: { type: "boolean" }, tref: { type: "string" }, shared: { type: "string" }, json: { type: "boolean" } },
  });
  if (positionals.length < 2) throw new CliError("global needs two or more FILEs.", 2);
  if (!values.model) throw new CliError("global needs --model NAME (for example --model first-order).", 2);
  if (Boolean(values.arrhenius) === Boolean(values.shared)) throw new CliError("global needs exactly one of --arrhenius or --shared P[,P...].", 2);
  if (values.tref !== undefined && !values.arrhenius) throw new CliError("--tref goes with --arrhenius.", 2);
  const trefC = values.tref === undefined ? undefined : Number(values.tref);
  if (trefC !== undefined && !Number.isFinite(trefC)) throw new CliError(`--tref ${values.tref}: give the reference temperature in °C as a number.`, 2);
  const runs: GlobalRun[] = positionals.map((file) => {
    const p = parseFile(file);
    const s = p.series[0]!;
    const tc = typeof p.metadata.temperature_c === "number" ? p.metadata.temperature_c : null;
    if (values.arrhenius && tc === null) throw new CliError(`${file}: no temperature in the file's metadata; the Arrhenius form needs each run's temperature (a line such as "Temperature: 25 °C").`);
    return { label: file, t: s.t, y: s.y, temperatureK: tc === null ? null : celsiusToKelvin(tc) };
  });
  let r: GlobalFitResult;
  try {
    r = fitGlobal(values.model, runs, values.arrhenius ? { kind: "arrhenius", trefK: trefC === undefined ? undefined : celsiusToKelvin(trefC) } : { kind: "shared", shared: values.shared!.split(",").map((x) => x.trim()).filter(Boolean) });
  } catch (e) {
    if (e instanceof GlobalFitError) throw new CliError(e.message);
    throw e;
  }
  const kelvinToC = (k: number | null) => (k === null ? null : Math.round((k - 273.15) * 1e9) / 1e9);
  return {
    model: r.model,
    shared: r.shared,
    tref_c: kelvinToC(r.tref_k),
    n: r.n,
    dof: r.dof,
    ssr: r.ssr,
    parameters: r.parameters,
    runs: r.runs.map((x) => ({ file: x.label, temperature_c: kelvinToC(x.temperature_k), n: x.n, parameters: x.parameters, k: x.k, ssr_share: x.ssr_share, runs_z: x.runs_z })),
    correlation: r.correlation,
    converged: r.converged,
    iterations: r.iterations,
    message: r.message,
    warnings: r.warnings,
    engine: ENGINE_VERSION,
  };
}

async function cmdIngest(argv: string[]): Promise<unknown> {
  const { ingestCommand } = await import("./ingest");
  return ingestCommand(argv);
}

export async function runCli(argv: string[]): Promise<{ code: number; out?: string; err?: string }> {
  const [verb, ...rest] = argv;
  try {
    if (!verb || verb === "help" || verb === "--help") return { code: verb ? 0 : 2, out: USAGE };
    let result: unknown;
    if (verb === "parse") {
      const { positionals } = parseArgs({ args: rest, allowPositionals: true, options: { json: { type: "boolean" }, parser: { type: "string" } } });
      result = seriesForCli(parseFile(positionals[0] ?? (readFileBytes(undefined) as never)));
    } else if (verb === "fit") result = cmdFit(rest);
    else if (verb === "arrhenius") result = cmdArrhenius(rest);
    else if (verb === "global") result = cmdGlobal(rest);
    else if (verb === "ingest") result = await cmdIngest(rest);
    else if (verb === "setup") {
      const { setupCommand } = await import("./setup");
      const r = (await setupCommand(rest)) as { lab_id: number; user_id: number };
      if (!rest.includes("--json")) return { code: 0, out: `Lab ${r.lab_id} created with its administrator (user ${r.user_id}). Start the server with npm start and sign in.
` };
      result = r;
    }
    else if (verb === "validate") {
      const { values } = parseArgs({ args: rest, allowPositionals: false, options: { json: { type: "boolean" }, reference: { type: "string" } } });
      const { runValidation } = await import("@/lib/validation");
      const report = runValidation({ referenceDir: values.reference, onProgress: values.json ? undefined : (d, n, id) => process.stderr.write(`\r${d}/${n} ${id.padEnd(30)}`) });
      if (!values.json) {
        process.stderr.write("\n");
        const lines = report.cases.filter((c) => !c.pass).map((c) => `FAIL ${c.id}: ours ${c.ours} against ${c.reference} (${c.threshold}; ${c.source})`);
        const out = `${lines.join("\n")}${lines.length ? "\n" : ""}${report.passed} passed, ${report.failed} failed\n`;
        return { code: report.all_passed ? 0 : 1, out };
      }
      return { code: report.all_passed ? 0 : 1, out: JSON.stringify(report, null, 2) + "\n" };
    }
    else throw new CliError(`there is no verb "${verb}".\n\n${USAGE}`, 2);
    return { code: 0, out: JSON.stringify(result, null, 2) + "\n" };
  } catch (e) {
    if (e instanceof CliError) return { code: e.exitCode, err: `halflight: ${e.message}\n` };
    if (e instanceof TypeError && /parseArgs|Unknown option|ERR_PARSE_ARGS/.test(String((e as { code?: string }).code ?? e.message)))
      return { code: 2, err: `halflight: ${e.message}\n\n${USAGE}` };
    throw e;
  }
}

if (process.argv[1] && /lib[\\/]cli[\\/]main\.ts$/.test(process.argv[1])) {
  runCli(process.argv.slice(2)).then(({ code, out, err }) => {
    if (out) process.stdout.write(out);
    if (err) process.stderr.write(err);
    process.exitCode = code;
  });
}
