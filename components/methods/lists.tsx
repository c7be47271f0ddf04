"use client";
// The methods and calibrations lists (server-side sorted, filtered and paged through the shared DataTable).
import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { DataTable, type DataColumn, type ServerListState } from "@/components/ui/data-table";
import { formatNumber } from "@/lib/format/number";

export interface MethodRow {
  id: number;
  record_id: number;
  version: number;
  name: string;
  analyte: string;
  wavelength_nm: number | null;
  models: string[];
  criteria: number;
  concentration: string;
  author: string | null;
  created_at: string;
}

const METHOD_COLUMNS: DataColumn<MethodRow>[] = [
  { id: "name", header: "Method", cell: ({ row }) => <Link className="font-semibold text-quartz-700 hover:underline" href={`/methods/${row.original.id}`}>{row.original.name}</Link> },
  { id: "analyte", header: "Analyte", cell: ({ row }) => row.original.analyte },
  { id: "wavelength", header: "λ (nm)", enableSorting: false, meta: { numeric: true }, cell: ({ row }) => row.original.wavelength_nm ?? "—" },
  { id: "concentration", header: "Concentration from", enableSorting: false, cell: ({ row }) => ({ none: "absorbance only", "beer-lambert": "ε (Beer–Lambert)", calibration: "calibration curve" })[row.original.concentration] ?? row.original.concentration },
  { id: "criteria", header: "Criteria", enableSorting: false, meta: { numeric: true }, cell: ({ row }) => row.original.criteria },
  { id: "version", header: "Version", meta: { numeric: true }, cell: ({ row }) => row.original.version },
  { id: "created_at", header: "Saved", cell: ({ row }) => `${row.original.created_at.slice(0, 10)} · ${row.original.author ?? "—"}` },
];

export function MethodList({ rows, state }: { rows: MethodRow[]; state: ServerListState }) {
  return <DataTable caption="Methods" columns={METHOD_COLUMNS} rows={rows} state={state} searchLabel="Search name or analyte" empty="No methods yet." rowTestId={(r) => `method-${r.record_id}`} />;
}

export interface CalibrationRow {
  id: number;
  name: string;
  analyte: string;
  unit: string;
  wavelength_nm: number | null;
  slope: number;
  r2: number;
  n: number;
  lod: number;
  loq: number;
  linear: boolean;
  author: string | null;
  created_at: string;
}

const CALIBRATION_COLUMNS: DataColumn<CalibrationRow>[] = [
  { id: "name", header: "Calibration", cell: ({ row }) => <Link className="font-semibold text-quartz-700 hover:underline" href={`/methods/calibrations/${row.original.id}`}>{row.original.name}</Link> },
  { id: "analyte", header: "Analyte", cell: ({ row }) => row.original.analyte },
  { id: "slope", header: "Slope", meta: { numeric: true }, cell: ({ row }) => `${formatNumber(row.original.slope, 5)} per ${row.original.unit}` },
  { id: "r2", header: "r²", enableSorting: false, meta: { numeric: true }, cell: ({ row }) => row.original.r2.toFixed(5) },
  { id: "n", header: "Standards", enableSorting: false, meta: { numeric: true }, cell: ({ row }) => row.original.n },
  { id: "lod", header: "LOD / LOQ", meta: { numeric: true }, cell: ({ row }) => `${formatNumber(row.original.lod, 3)} / ${formatNumber(row.original.loq, 3)} ${row.original.unit}` },
  { id: "linear", header: "Linearity", enableSorting: false, cell: ({ row }) => (row.original.linear ? <Badge tone="pass">linear</Badge> : <Badge tone="caution">check range</Badge>) },
  { id: "created_at", header: "Saved", cell: ({ row }) => `${row.original.created_at.slice(0, 10)} · ${row.original.author ?? "—"}` },
];

export function CalibrationList({ rows, state }: { rows: CalibrationRow[]; state: ServerListState }) {
  return <DataTable caption="Calibration curves" columns={CALIBRATION_COLUMNS} rows={rows} state={state} searchLabel="Search name or analyte" empty="No calibration curves yet." rowTestId={(r) => `calibration-${r.id}`} />;
}
