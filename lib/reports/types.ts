// The shape every report answers with: charts drawn from the same figures as its tables, and
// tables whose cells are already the text the screen and the CSV show (so both are the same).

export type Cell = string | number | null;

export interface ReportColumn {
  key: string;
  label: string;
  /** Right-aligned in the table. */
  numeric?: boolean;
}

export interface ReportTable {
  key: string;
  title: string;
  columns: ReportColumn[];
  rows: Record<string, Cell>[];
}

export interface ChartSeries {
  key: string;
  label: string;
}

export interface ReportChart {
  kind: "line" | "bar" | "stacked-bar";
  title: string;
  /** The key of the category axis in each point. */
  x: string;
  xLabel: string;
  yLabel: string;
  /** "%" draws the value axis from 0 to 100. */
  unit?: "%";
  series: ChartSeries[];
  points: Record<string, string | number | null>[];
  /** A horizontal line to compare against (a capacity, a target). */
  reference?: { value: number; label: string };
}

export interface Report {
  name: string;
  title: string;
  /** Sentences under the title: what is counted and how. */
  notes: string[];
  charts: ReportChart[];
  tables: ReportTable[];
}

/** A share as a percentage with one decimal ("93.3"), or null when nothing was counted. */
export function percent(part: number, whole: number): string | null {
  if (whole === 0) return null;
  return ((part * 100) / whole).toFixed(1);
}
