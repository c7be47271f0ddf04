"use client";
// Upload: drop files, watch each upload's progress, check the preview (first lines, channels plotted, metadata and
// units found), adjust the mapping, save. Nothing is stored before "Save run".
import Link from "next/link";
import { Fragment, useCallback, useState } from "react";
import { useDropzone } from "react-dropzone";
import { Plot } from "@/components/plot/plot";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Input, Select } from "@/components/ui/field";
import { CHANNEL_PALETTE, solutionColour } from "@/lib/colour/wavelength";
import { parseDecimalField } from "@/lib/format/input";
import { formatBytes } from "@/lib/format/number";
import { uploadWithProgress } from "@/lib/http/upload";
import type { RunMapping, UploadPreview } from "@/lib/schemas/runs";

const numOrNull = parseDecimalField;

type Status = "uploading" | "previewed" | "refused" | "saving" | "saved";
interface Item {
  key: string;
  file: File;
  status: Status;
  progress: number;
  preview?: UploadPreview;
  error?: string;
  mapping: RunMapping;
  saved?: { run_id: number; existing: boolean };
}

type Limits = { maxMB: number; maxChannels: number; maxPoints: number };
type MethodChoice = { record_id: number; name: string; version: number; wavelength_nm?: number | null };

function errorOf(body: unknown): string | null {
  const e = (body as { error?: { message?: string } } | null)?.error;
  return e ? (e.message ?? "The server refused the file.") : null;
}

function initialMapping(p: UploadPreview): RunMapping {
  return {
    parser: p.parser,
    channels: p.series.map((s) => ({ source: s.name, include: true, name: s.name })),
    blank: null,
    dilutionFactor: null,
    run: {
      name: p.suggested.name,
      wavelength_nm: p.suggested.wavelength_nm,
      path_length_cm: p.suggested.path_length_cm,
      temperature_c: p.suggested.temperature_c,
      operator: p.suggested.operator,
      sample: p.suggested.sample,
    },
  };
}

/** The values read from the file's metadata, in words (the keys as the file wrote them are in the raw lines above). */
const RECOGNISED: Array<[string, string, string]> = [
  ["wavelength_nm", "wavelength", "nm"],
  ["path_length_cm", "path length", "cm"],
  ["temperature_c", "temperature", "°C"],
  ["operator", "operator", ""],
  ["sample", "sample", ""],
];
function recognised(metadata: Record<string, string | number>): string {
  const found = RECOGNISED.filter(([k]) => metadata[k] !== undefined).map(([k, label, unit]) => `${label} ${metadata[k]}${unit ? ` ${unit}` : ""}`);
  return found.length ? found.join(", ") : "nothing";
}

export function UploadWorkspace({ limits, methods = [] }: { limits: Limits; methods?: MethodChoice[] }) {
  const [items, setItems] = useState<Item[]>([]);
  const update = useCallback((key: string, patch: Partial<Item> | ((i: Item) => Partial<Item>)) => {
    setItems((all) => all.map((i) => (i.key === key ? { ...i, ...(typeof patch === "function" ? patch(i) : patch) } : i)));
  }, []);

  const preview = useCallback(
    async (key: string, file: File, extra: Record<string, string> = {}) => {
      update(key, { status: "uploading", progress: 0, error: undefined });
      if (file.size > limits.maxMB * 1048576) {
        update(key, { status: "refused", error: `${file.name} is ${formatBytes(file.size)}; the limit is ${limits.maxMB} MB per file.` });
        return;
      }
      const form = new FormData();
      form.set("file", file);
      for (const [k, v] of Object.entries(extra)) form.set(k, v);
      try {
        const r = await uploadWithProgress<UploadPreview>("/api/uploads", form, (f) => update(key, { progress: f }));
        const err = errorOf(r.body);
        if (err) update(key, { status: "refused", error: err, progress: 1 });
        else {
          const p = r.body as UploadPreview;
          update(key, (i) => ({ status: "previewed", progress: 1, preview: p, mapping: { ...initialMapping(p), timeColumn: extra.timeColumn ?? i.mapping.timeColumn } }));
        }
      } catch (e) {
        update(key, { status: "refused", error: (e as Error).message });
      }
    },
    [limits.maxMB, update],
  );

  const onDrop = useCallback(
    (files: File[]) => {
      const added = files.map((file) => ({ key: `${file.name}-${file.size}-${file.lastModified}-${Math.random()}`, file, status: "uploading" as Status, progress: 0, mapping: { run: {} } }));
      setItems((all) => [...added, ...all]);
      for (const a of added) void preview(a.key, a.file);
    },
    [preview],
  );
  const { getRootProps, getInputProps, isDragActive, open } = useDropzone({ onDrop, multiple: true, noClick: true, noKeyboard: true });

  async function save(item: Item) {
    if (!item.preview) return;
    update(item.key, { status: "saving", progress: 0, error: undefined });
    const form = new FormData();
    form.set("file", item.file);
    form.set("sha256", item.preview.sha256);
    form.set("mapping", JSON.stringify(item.mapping));
    try {
      const r = await uploadWithProgress<{ run_id: number; existing: boolean }>("/api/runs", form, (f) => update(item.key, { progress: f }));
      const err = errorOf(r.body);
      if (err) update(item.key, { status: "previewed", error: err });
      else update(item.key, { status: "saved", saved: r.body as { run_id: number; existing: boolean } });
    } catch (e) {
      update(item.key, { status: "previewed", error: (e as Error).message });
    }
  }

  return (
    <div className="space-y-6">
      <div
        {...getRootProps()}
        data-testid="dropzone"
        className={`rounded-cell border-2 border-dashed px-6 py-10 text-center transition-colors ${isDragActive ? "border-quartz-600 bg-quartz-100" : "border-ink-300 bg-paper-raised"}`}
      >
        <input {...getInputProps()} aria-label="Choose export files" data-testid="file-input" />
        <p className="text-lg font-semibold">{isDragActive ? "Drop to read the files" : "Drag exports here"}</p>
        <p className="mt-1 text-sm text-ink-500">CSV or text (comma, semicolon, tab or spaces; decimal point or comma; %T or absorbance) and JCAMP-DX.</p>
        <Button variant="secondary" className="mt-4" onClick={open}>
          Choose files…
        </Button>
        <p className="mt-4 text-xs text-ink-500">
          Limits: {limits.maxMB} MB per file, {limits.maxChannels} channels, {limits.maxPoints.toLocaleString("en")} readings in all.
        </p>
      </div>
      {items.length === 0 && <p className="text-sm text-ink-500">No files yet. Each file you add is listed here with its preview.</p>}
      {items.map((item) => (
        <FileCard key={item.key} item={item} methods={methods} onMapping={(m) => update(item.key, { mapping: m })} onSave={() => save(item)} onTimeColumn={(c) => preview(item.key, item.file, { timeColumn: c })} />
      ))}
    </div>
  );
}

function Progress({ value, label }: { value: number; label: string }) {
  return (
    <div className="mt-2">
      <div role="progressbar" aria-label={label} aria-valuemin={0} aria-valuemax={100} aria-valuenow={Math.round(value * 100)} className="h-2 w-full overflow-hidden rounded-full bg-ink-100">
        <div className="h-full bg-quartz-600 transition-[width]" style={{ width: `${Math.round(value * 100)}%` }} />
      </div>
      <p className="mt-1 text-xs text-ink-500">{label}: {Math.round(value * 100)} %</p>
    </div>
  );
}

function FileCard({ item, methods, onMapping, onSave, onTimeColumn }: { item: Item; methods: MethodChoice[]; onMapping: (m: RunMapping) => void; onSave: () => void; onTimeColumn: (c: string) => void }) {
  const p = item.preview;
  const m = item.mapping;
  const setRun = (patch: Partial<RunMapping["run"]>) => onMapping({ ...m, run: { ...m.run, ...patch } });
  const base = solutionColour(m.run.wavelength_nm ?? null).hex;
  return (
    <article className="rounded-cell bg-paper-raised p-5 shadow-lift" aria-label={`File ${item.file.name}`} data-testid="upload-card">
      <header className="flex flex-wrap items-center gap-3">
        <h2 className="text-lg font-semibold">{item.file.name}</h2>
        <span className="text-sm text-ink-500">{formatBytes(item.file.size)}</span>
        {item.status === "refused" && <Badge tone="fault">Refused</Badge>}
        {item.status === "previewed" && !p?.existing && <Badge tone="accent">Read, not stored yet</Badge>}
        {item.status === "saved" && <Badge tone="pass">Stored</Badge>}
        {p && <span className="font-mono text-xs text-ink-500">SHA-256 {p.sha256.slice(0, 16)}…</span>}
      </header>
      {(item.status === "uploading" || item.status === "saving") && <Progress value={item.progress} label={item.status === "uploading" ? "Uploading for preview" : "Saving"} />}
      {item.error && (
        <p role="alert" className="mt-3 rounded-cell bg-fault-100 px-3 py-2 text-sm text-fault-700" data-testid="upload-error">
          {item.error}
        </p>
      )}
      {item.status === "saved" && item.saved && (
        <p className="mt-3 text-sm" data-testid="saved-note">
          {item.saved.existing ? "This file was already stored: " : "Stored as "}
          <Link className="font-semibold text-quartz-700 underline" href={`/runs/${item.saved.run_id}`}>
            run {item.saved.run_id}
          </Link>
          .
        </p>
      )}
      {p && item.status !== "saved" && (
        <div className="mt-4 space-y-5">
          {p.existing && (
            <div className="rounded-cell border-l-4 border-caution-700 bg-caution-100 px-4 py-3 text-sm text-caution-700" data-testid="duplicate-note">
              This exact file (same SHA-256) is already stored as{" "}
              <Link href={`/runs/${p.existing.run_id}`} className="font-semibold underline">
                {p.existing.name} (run {p.existing.run_id})
              </Link>
              , uploaded {p.existing.created_at.slice(0, 16).replace("T", " ")} UTC. Open it instead; saving again adds nothing.
            </div>
          )}
          {p.warnings.length > 0 && (
            <ul className="list-disc rounded-cell bg-caution-100 py-2 pl-8 pr-4 text-sm text-caution-700" aria-label="Notes from reading the file">
              {p.warnings.map((w) => <li key={w}>{w}</li>)}
            </ul>
          )}
          <div className="grid gap-5 lg:grid-cols-2">
            <section>
              <h3 className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-700">The file&apos;s first lines</h3>
              <pre className="max-h-64 overflow-auto rounded-cell bg-paper-sunk p-3 font-mono text-xs leading-5">
                {p.head.map((h) => (
                  <span key={h.line} className="block">
                    <span className="mr-3 inline-block w-6 select-none text-right text-ink-500">{h.line}</span>
                    {h.text}
                  </span>
                ))}
              </pre>
              <p className="mt-2 text-xs text-ink-500">
                Parser: {p.parser} ({p.parsers.map((x) => `${x.name} ${x.confidence.toFixed(2)}`).join(", ")}). Read from the file: {recognised(p.metadata)}.
              </p>
            </section>
            <section>
              <h3 className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-700">Channels as read</h3>
              <Plot
                height={220}
                label={`Preview of ${item.file.name}`}
                data={p.series.map((s, i) => ({ type: "scatter", mode: s.points > 200 ? "lines" : "lines+markers", name: s.name, x: s.t, y: s.y, marker: { size: 4, color: p.series.length === 1 ? base : CHANNEL_PALETTE[i % CHANNEL_PALETTE.length] } }))}
                layout={{ xaxis: { title: { text: "t (s)" } }, yaxis: { title: { text: p.series[0]?.unit === "AU" ? "A (AU)" : (p.series[0]?.unit ?? "") } } }}
              />
              <p className="mt-3 text-xs text-ink-700">The first readings as they will be stored (time converted to seconds), to check against the file&apos;s lines:</p>
              <div className="relative mt-1 overflow-x-auto">
                <table className="text-xs" data-testid="parsed-numbers">
                  <caption className="sr-only">The first readings as they will be stored</caption>
                  <thead>
                    <tr className="text-left text-ink-700">
                      {p.series.map((s) => (
                        <Fragment key={s.name}>
                          <th className="px-2 text-right font-semibold">t (s)</th>
                          <th className="px-2 text-right font-semibold">{s.name}</th>
                        </Fragment>
                      ))}
                    </tr>
                  </thead>
                  <tbody className="num font-mono">
                    {Array.from({ length: Math.max(...p.series.map((s) => s.first_t.length)) }, (_, r) => (
                      <tr key={r}>
                        {p.series.map((s) => (
                          <Fragment key={s.name}>
                            <td className="px-2 text-right">{s.first_t[r] ?? ""}</td>
                            <td className="px-2 text-right">{s.first_y[r] === undefined ? "" : Number(s.first_y[r]!.toPrecision(6))}</td>
                          </Fragment>
                        ))}
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </section>
          </div>
          <section aria-label="Mapping">
            <h3 className="mb-2 text-sm font-semibold uppercase tracking-wide text-ink-700">Channels and mapping</h3>
            <div className="mb-3 max-w-xs">
              <Select
                label="Time column"
                value={m.timeColumn ?? p.columns.find((c) => c.role === "time")?.header ?? ""}
                options={p.columns.map((c) => ({ value: c.header, label: c.header }))}
                onChange={(e) => onTimeColumn(e.target.value)}
                disabled={p.columns.length === 0}
                hint={p.columns.length === 0 ? "Fixed by the file format." : "Re-reads the file with this column as time."}
              />
            </div>
            <table className="w-full text-sm">
              <thead>
                <tr className="text-left text-xs uppercase text-ink-500">
                  <th className="py-1">Keep</th>
                  <th>Name to store</th>
                  <th>Read as</th>
                  <th className="text-right">Points</th>
                  <th className="text-right">Skipped</th>
                </tr>
              </thead>
              <tbody>
                {p.series.map((s, i) => {
                  const c = m.channels?.[i] ?? { source: s.name, include: true, name: s.name };
                  const isBlank = m.blank === s.name;
                  const setChannel = (patch: Partial<typeof c>) => onMapping({ ...m, channels: (m.channels ?? []).map((x, j) => (j === i ? { ...x, ...patch } : x)) });
                  return (
                    <tr key={s.name} className="border-t border-ink-100">
                      <td className="py-1.5">
                        <input type="checkbox" checked={c.include && !isBlank} disabled={isBlank} onChange={(e) => setChannel({ include: e.target.checked })} aria-label={`Keep ${s.name}`} />
                      </td>
                      <td>
                        <input value={c.name ?? s.name} onChange={(e) => setChannel({ name: e.target.value })} aria-label={`Name for ${s.name}`} className="h-8 w-full max-w-xs rounded-cell border border-ink-300 px-2" />
                      </td>
                      <td>
                        <select
                          aria-label={`Quantity of ${s.name}`}
                          value={c.quantity ?? (s.quantity === "transmittance-converted absorbance" ? "absorbance" : s.quantity)}
                          onChange={(e) => setChannel({ quantity: e.target.value as "absorbance" | "concentration" | "signal" })}
                          className="h-8 rounded-cell border border-ink-300 px-1"
                        >
                          <option value="absorbance">{s.quantity === "transmittance-converted absorbance" ? "absorbance (from %T)" : "absorbance"}</option>
                          <option value="concentration">concentration</option>
                          <option value="signal">other signal</option>
                        </select>{" "}
                        <input
                          aria-label={`Unit of ${s.name}`}
                          value={c.unit ?? s.unit}
                          onChange={(e) => setChannel({ unit: e.target.value || undefined })}
                          className="h-8 w-20 rounded-cell border border-ink-300 px-2"
                        />
                      </td>
                      <td className="num text-right font-mono">{s.points}</td>
                      <td className="num text-right font-mono">{s.skipped_lines.length}</td>
                    </tr>
                  );
                })}
              </tbody>
            </table>
            <div className="mt-4 grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
              <Input label="Run name" value={m.run.name ?? ""} onChange={(e) => setRun({ name: e.target.value })} required />
              <Input label="Study" value={m.run.study ?? ""} onChange={(e) => setRun({ study: e.target.value || null })} hint="Groups runs, e.g. a temperature series." />
              <Input label="Sample or lot" value={m.run.sample ?? ""} onChange={(e) => setRun({ sample: e.target.value || null })} />
              <Input label="Cell" value={m.run.cell ?? ""} onChange={(e) => setRun({ cell: e.target.value || null })} />
              <Input label="Wavelength (nm)" inputMode="decimal" value={m.run.wavelength_nm ?? ""} onChange={(e) => setRun({ wavelength_nm: numOrNull(e.target.value) })} />
              <Input label="Path length (cm)" inputMode="decimal" value={m.run.path_length_cm ?? ""} onChange={(e) => setRun({ path_length_cm: numOrNull(e.target.value) })} />
              <Input label="Temperature (°C)" inputMode="decimal" value={m.run.temperature_c ?? ""} onChange={(e) => setRun({ temperature_c: numOrNull(e.target.value) })} />
              <Input label="Dilution factor" inputMode="decimal" value={m.dilutionFactor ?? ""} onChange={(e) => onMapping({ ...m, dilutionFactor: numOrNull(e.target.value) })} />
              <Input label="Operator" value={m.run.operator ?? ""} onChange={(e) => setRun({ operator: e.target.value || null })} />
              {methods.length > 0 ? (
                <Select
                  label="Method"
                  value={m.run.method_id ? String(m.run.method_id) : ""}
                  options={[{ value: "", label: "No method" }, ...methods.map((x) => ({ value: String(x.record_id), label: `${x.name} (v${x.version})` }))]}
                  onChange={(e) => setRun({ method_id: e.target.value ? Number(e.target.value) : null })}
                  hint="Its fits are judged by the method's acceptance criteria."
                />
              ) : (
                <Input label="Method (as written)" value={m.run.method ?? ""} onChange={(e) => setRun({ method: e.target.value || null })} hint="No methods are defined in this lab yet." />
              )}
              <Select
                label="Blank channel"
                value={m.blank ?? ""}
                options={[{ value: "", label: "None" }, ...p.series.map((s) => ({ value: s.name, label: s.name }))]}
                onChange={(e) => onMapping({ ...m, blank: e.target.value || null })}
                hint="Subtracted from the other channels at equal times."
              />
            </div>
          </section>
          <div className="flex items-center gap-3">
            <Button onClick={onSave} disabled={item.status === "saving" || !m.run.name} data-testid="save-run">
              {p.existing ? "Save anyway (adds nothing)" : "Save run"}
            </Button>
            <span className="text-sm text-ink-500">Stores the original file, the run and its channels in one step, with an audit-trail entry.</span>
          </div>
        </div>
      )}
    </article>
  );
}
