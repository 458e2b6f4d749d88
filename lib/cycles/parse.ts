// Parses the CSV record a washer-disinfector or steriliser exports into a CycleRecord.
//
// The file needs a header row (the accepted headers are listed in ./headers.ts) and one row per
// sample. Columns may be separated by commas, semicolons or tabs: the separator is the one that
// occurs most often in the header line. With semicolons or tabs, numbers may use a decimal comma
// ("90,5"). Blank lines are skipped. Every problem found is reported with its line and column and
// what to change; up to MAX_RECORD_ISSUES problems are collected into one CycleRecordError.

import Papa from "papaparse";
import { isValid, parseISO } from "date-fns";
import { CycleRecordError, MAX_RECORD_ISSUES, placeOf, type CycleRecordIssue } from "./errors";
import { classifyHeader } from "./headers";
import {
  STANDARD_ATMOSPHERE_KPA,
  type CycleRecord,
  type CycleRecordColumns,
  type CycleSample,
  type PressureReference,
  type PressureUnit,
  type TemperatureUnit,
} from "./record";
import { toCelsius, toKpaAbsolute } from "./units";

/** Plausibility bounds: no washer or steam steriliser record holds values outside these. */
export const PLAUSIBLE_TEMP_C = { min: -20, max: 200 } as const;
export const PLAUSIBLE_PRESSURE_KPA_ABS = { min: 0, max: 1000 } as const;

export interface SterilizerParseOptions {
  /**
   * Surrounding air pressure used to turn gauge readings into absolute pressure, in kPa.
   * Defaults to the standard atmosphere (101.325 kPa) — an assumption; give the unit's
   * barometric pressure where it differs (altitude, weather).
   */
  atmosphereKpa?: number;
}

// Parses a washer-disinfector record: time, temperature and an optional stage column.
// Pressure columns are not used for washers and are listed as ignored.
export function parseWasherRecord(csvText: string): CycleRecord {
  return parseCycleRecord(csvText, { pressure: "ignored", atmosphereKpa: STANDARD_ATMOSPHERE_KPA });
}

// Parses a steam steriliser record: time, temperature, chamber pressure and an optional stage column.
export function parseSterilizerRecord(csvText: string, opts: SterilizerParseOptions = {}): CycleRecord {
  const atmosphereKpa = opts.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  if (!Number.isFinite(atmosphereKpa) || atmosphereKpa <= 0) {
    throw new RangeError(`atmosphereKpa must be a positive number of kPa, got ${atmosphereKpa}`);
  }
  return parseCycleRecord(csvText, { pressure: "required", atmosphereKpa });
}

interface ParseSettings {
  pressure: "required" | "ignored";
  atmosphereKpa: number;
}

interface RawRow {
  line: number;
  fields: string[];
}

type Delimiter = "," | ";" | "\t";

const DELIMITER_NAMES: Record<Delimiter, string> = { ",": "commas", ";": "semicolons", "\t": "tabs" };
const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;
const DECIMAL_COMMA = /^([+-]?\d*),(\d+)$/;
const TIMESTAMP =
  /^(\d{4}-\d{2}-\d{2})[T ](\d{2}:\d{2}(?::\d{2}(?:[.,]\d+)?)?)\s*(Z|[+-]\d{2}(?::?\d{2})?)$/i;

class IssueList {
  readonly items: CycleRecordIssue[] = [];

  add(issue: Omit<CycleRecordIssue, "message">, fix: string): void {
    if (this.items.length >= MAX_RECORD_ISSUES) return;
    const place = placeOf(issue);
    this.items.push({ ...issue, message: place ? `${place}: ${fix}` : capitalise(fix) });
  }

  get full(): boolean {
    return this.items.length >= MAX_RECORD_ISSUES;
  }

  throwIfAny(): void {
    if (this.items.length > 0) throw new CycleRecordError(this.items);
  }
}

function parseCycleRecord(csvText: string, settings: ParseSettings): CycleRecord {
  const issues = new IssueList();
  const text = csvText.replace(/^\uFEFF/, "").replace(/\r\n?/g, "\n");
  if (text.trim() === "") {
    issues.add({ code: "empty" }, "the file is empty; export the cycle record as CSV with a header row and one row per sample");
    issues.throwIfAny();
  }

  const delimiter = detectDelimiter(text);
  const rows = readRows(text, delimiter, issues);
  issues.throwIfAny();
  const nonBlank = rows.filter((r) => r.fields.some((f) => f.trim() !== ""));
  const [headerRow, ...dataRows] = nonBlank;
  const layout = readHeader(headerRow, delimiter, settings, issues);
  issues.throwIfAny();
  if (!layout) throw new Error("unreachable: header without issues but no layout");

  const samples: CycleSample[] = [];
  let startMs: number | undefined;
  let previous: { line: number; time: number } | undefined;
  let startTime: number | undefined;

  for (const row of dataRows) {
    if (issues.full) break;
    if (row.fields.length !== layout.fieldCount) {
      const hint =
        delimiter === "," && row.fields.length > layout.fieldCount
          ? "; if the numbers use a decimal comma, separate the columns with semicolons"
          : "";
      issues.add(
        { code: "field_count", line: row.line },
        `this row has ${row.fields.length} field${row.fields.length === 1 ? "" : "s"} but the header has ${layout.fieldCount}; columns must be separated by ${DELIMITER_NAMES[delimiter]} like the header${hint}`,
      );
      continue;
    }
    const sample = readSample(row, layout, delimiter, settings, issues);
    if (!sample) continue;

    if (previous !== undefined) {
      if (sample.time === previous.time) {
        issues.add(
          { code: "duplicate_time", line: row.line, column: layout.time.index + 1, columnName: layout.time.header },
          `the time repeats line ${previous.line}; each sample needs its own time, so remove the repeated row`,
        );
        continue;
      }
      if (sample.time < previous.time) {
        issues.add(
          { code: "unsorted_time", line: row.line, column: layout.time.index + 1, columnName: layout.time.header },
          `the time is earlier than on line ${previous.line}; sort the rows by time, earliest first`,
        );
        continue;
      }
    }
    previous = { line: row.line, time: sample.time };
    if (startTime === undefined) {
      startTime = sample.time;
      if (layout.time.kind === "timestamp") startMs = sample.time * 1000;
    }
    const s: CycleSample = { t: sample.time - startTime, tempC: sample.tempC };
    if (sample.pressureKpaAbs !== undefined) s.pressureKpaAbs = sample.pressureKpaAbs;
    if (sample.phase !== undefined) s.phase = sample.phase;
    samples.push(s);
  }
  issues.throwIfAny();

  if (samples.length < 2) {
    issues.add(
      { code: "too_few_samples" },
      `the record holds ${samples.length} sample${samples.length === 1 ? "" : "s"}; at least 2 rows of values are needed below the header`,
    );
    issues.throwIfAny();
  }

  const record: CycleRecord = { samples, columns: layout.columns, ignoredColumns: layout.ignored };
  if (startMs !== undefined) record.startedAt = new Date(startMs).toISOString();
  return record;
}

// The separator that occurs most often in the header line (outside quotes); commas on a tie.
function detectDelimiter(text: string): Delimiter {
  const firstLine = text.split("\n").find((l) => l.trim() !== "") ?? "";
  const counts: Record<Delimiter, number> = { ",": 0, ";": 0, "\t": 0 };
  let quoted = false;
  for (const ch of firstLine) {
    if (ch === '"') quoted = !quoted;
    else if (!quoted && (ch === "," || ch === ";" || ch === "\t")) counts[ch] += 1;
  }
  let best: Delimiter = ",";
  for (const d of [";", "\t"] as const) if (counts[d] > counts[best]) best = d;
  return best;
}

// Splits the text into rows with papaparse, remembering the line each row starts on.
function readRows(text: string, delimiter: Delimiter, issues: IssueList): RawRow[] {
  const rows: RawRow[] = [];
  let line = 1;
  let cursor = 0;
  Papa.parse<string[]>(text, {
    delimiter,
    newline: "\n",
    step: (result) => {
      const end = result.meta.cursor;
      rows.push({ line, fields: result.data });
      for (const e of result.errors) {
        const what = e.message.replace(/\.$/, "");
        issues.add(
          { code: "quotes", line },
          `${what.charAt(0).toLowerCase()}${what.slice(1)}; close every opening double quote or remove stray quotes`,
        );
      }
      line += countNewlines(text, cursor, end);
      cursor = end;
    },
  });
  return rows;
}

function countNewlines(text: string, from: number, to: number): number {
  let n = 0;
  for (let i = from; i < to; i++) if (text.charCodeAt(i) === 10) n++;
  return n;
}

interface Layout {
  fieldCount: number;
  time: { index: number; header: string; kind: "elapsed_seconds" | "timestamp" };
  temperature: { index: number; header: string; unit: TemperatureUnit };
  pressure?: { index: number; header: string; unit: PressureUnit; reference: PressureReference };
  phase?: { index: number; header: string };
  columns: CycleRecordColumns;
  ignored: string[];
}

function readHeader(
  headerRow: RawRow | undefined,
  delimiter: Delimiter,
  settings: ParseSettings,
  issues: IssueList,
): Layout | undefined {
  if (!headerRow) {
    issues.add({ code: "empty" }, "the file holds no rows; export the cycle record as CSV with a header row");
    return undefined;
  }
  const line = headerRow.line;
  const headers = headerRow.fields.map((h) => h.trim());
  const nonEmpty = headers.filter((h) => h !== "");
  if (nonEmpty.length > 0 && nonEmpty.every((h) => parseNumber(h, delimiter) !== undefined || TIMESTAMP.test(h))) {
    issues.add(
      { code: "no_header", line },
      `the first line holds values (${nonEmpty.slice(0, 3).join(", ")}) but must name the columns; add a header row such as t_s,temp_c,phase`,
    );
    return undefined;
  }

  if (headers.length === 1 && looksLikeOtherSeparator(headers[0])) {
    issues.add(
      { code: "delimiter", line },
      `the header reads as a single column "${headers[0]}"; separate the columns with commas (semicolons and tabs are also accepted)`,
    );
    return undefined;
  }

  let time: Layout["time"] | undefined;
  let temperature: Layout["temperature"] | undefined;
  let pressure: Layout["pressure"] | undefined;
  let phase: Layout["phase"] | undefined;
  const ignored: string[] = [];
  const seen = new Map<string, number>();

  for (const [index, header] of headers.entries()) {
    const place = { line, column: index + 1, columnName: header };
    const role = classifyHeader(header);
    const quantity = role.role === "unknown_unit" ? role.quantity : role.role;
    if (settings.pressure === "ignored" && quantity === "pressure") {
      ignored.push(header);
      continue;
    }
    if (role.role === "ignored") {
      if (header !== "") ignored.push(header);
      continue;
    }
    const earlier = seen.get(quantity);
    if (earlier !== undefined) {
      issues.add(
        { code: "duplicate_column", ...place },
        `column ${earlier + 1} already holds the ${quantity}; keep one ${quantity} column and rename or remove the other`,
      );
      continue;
    }
    seen.set(quantity, index);
    switch (role.role) {
      case "unknown_unit":
        issues.add({ code: "unknown_unit", ...place }, role.message);
        continue;
      case "time":
        time = { index, header, kind: role.kind };
        continue;
      case "temperature":
        temperature = { index, header, unit: role.unit };
        continue;
      case "pressure":
        pressure = { index, header, unit: role.unit, reference: role.reference ?? "absolute" };
        continue;
      case "phase":
        phase = { index, header };
        continue;
    }
  }

  const found = nonEmpty.length > 0 ? ` (found: ${nonEmpty.join(", ")})` : "";
  if (!seen.has("time")) {
    issues.add(
      { code: "missing_column", line },
      `the header has no time column${found}; add t_s (elapsed seconds) or timestamp (ISO-8601 with Z or an offset)`,
    );
  }
  if (!seen.has("temperature")) {
    issues.add(
      { code: "missing_column", line },
      `the header has no temperature column${found}; add temp_c (°C) or temp_f (°F)`,
    );
  }
  if (settings.pressure === "required" && !seen.has("pressure")) {
    issues.add(
      { code: "missing_column", line },
      `the header has no pressure column${found}; a steriliser record needs one, e.g. pressure_kpa_abs, pressure_kpa_g, pressure_bar_g or pressure_mbar`,
    );
  }
  if (!time || !temperature || (settings.pressure === "required" && !pressure)) return undefined;

  const columns: CycleRecordColumns = {
    time: { header: time.header, kind: time.kind },
    temperature: { header: temperature.header, unit: temperature.unit },
  };
  if (pressure) {
    columns.pressure = {
      header: pressure.header,
      unit: pressure.unit,
      reference: pressure.reference,
      atmosphereKpa: settings.atmosphereKpa,
    };
  }
  if (phase) columns.phase = { header: phase.header };
  return { fieldCount: headers.length, time, temperature, pressure, phase, columns, ignored };
}

// A lone header such as "t_s|temp_c" or "t_s temp_c" that names two known columns.
function looksLikeOtherSeparator(header: string): boolean {
  const parts = header.split(/[|:\s]+/).filter((p) => p !== "");
  return parts.length >= 2 && parts.filter((p) => classifyHeader(p).role !== "ignored").length >= 2;
}

interface ReadSample {
  time: number;
  tempC: number;
  pressureKpaAbs?: number;
  phase?: string;
}

function readSample(
  row: RawRow,
  layout: Layout,
  delimiter: Delimiter,
  settings: ParseSettings,
  issues: IssueList,
): ReadSample | undefined {
  const before = issues.items.length;
  const cell = (c: { index: number; header: string }) => ({
    value: row.fields[c.index].trim(),
    place: { line: row.line, column: c.index + 1, columnName: c.header },
  });

  let time: number | undefined;
  {
    const { value, place } = cell(layout.time);
    if (value === "") {
      issues.add({ code: "missing_value", ...place }, "the time is empty; every sample needs its time");
    } else if (layout.time.kind === "elapsed_seconds") {
      time = parseNumber(value, delimiter);
      if (time === undefined) {
        issues.add(
          { code: "not_a_number", ...place },
          `"${value}" is not a number of seconds; write the elapsed time in seconds, e.g. 12 or 12.5`,
        );
      }
    } else {
      time = parseTimestamp(value);
      if (time === undefined) {
        const hint =
          parseNumber(value, delimiter) !== undefined
            ? `; if the column holds elapsed seconds, name it t_s instead of "${layout.time.header}"`
            : "";
        issues.add(
          { code: "bad_timestamp", ...place },
          `"${value}" is not an ISO-8601 timestamp with a time zone; write it like 2026-03-02T07:15:00Z or 2026-03-02T08:15:00+01:00${hint}`,
        );
      }
    }
  }

  let tempC: number | undefined;
  {
    const { value, place } = cell(layout.temperature);
    const unit = layout.temperature.unit;
    const raw = value === "" ? undefined : parseNumber(value, delimiter);
    if (value === "") {
      issues.add({ code: "missing_value", ...place }, "the temperature is empty; every sample needs its temperature");
    } else if (raw === undefined) {
      issues.add(
        { code: "not_a_number", ...place },
        `"${value}" is not a number; write the temperature in ${unitLabel(unit)} as a plain decimal number, e.g. 93.4`,
      );
    } else {
      tempC = toCelsius(raw, unit);
      if (tempC < PLAUSIBLE_TEMP_C.min || tempC > PLAUSIBLE_TEMP_C.max) {
        issues.add(
          { code: "out_of_range", ...place },
          `${value} ${unitLabel(unit)} is outside ${PLAUSIBLE_TEMP_C.min}…${PLAUSIBLE_TEMP_C.max} °C; check the value and the unit in the header`,
        );
        tempC = undefined;
      }
    }
  }

  let pressureKpaAbs: number | undefined;
  if (layout.pressure) {
    const p = layout.pressure;
    const { value, place } = cell(p);
    const raw = value === "" ? undefined : parseNumber(value, delimiter);
    if (value === "") {
      issues.add({ code: "missing_value", ...place }, "the pressure is empty; every sample of a steriliser record needs its pressure");
    } else if (raw === undefined) {
      issues.add(
        { code: "not_a_number", ...place },
        `"${value}" is not a number; write the pressure in ${p.unit} as a plain decimal number`,
      );
    } else {
      pressureKpaAbs = toKpaAbsolute(raw, p.unit, p.reference, settings.atmosphereKpa);
      if (pressureKpaAbs < PLAUSIBLE_PRESSURE_KPA_ABS.min || pressureKpaAbs > PLAUSIBLE_PRESSURE_KPA_ABS.max) {
        const hint =
          pressureKpaAbs < 0
            ? "below perfect vacuum; check whether the column is gauge or absolute"
            : `outside ${PLAUSIBLE_PRESSURE_KPA_ABS.min}…${PLAUSIBLE_PRESSURE_KPA_ABS.max} kPa absolute; check the value and the unit in the header`;
        issues.add({ code: "out_of_range", ...place }, `${value} ${p.unit} ${p.reference} is ${hint}`);
        pressureKpaAbs = undefined;
      }
    }
  }

  if (issues.items.length > before || time === undefined || tempC === undefined) return undefined;
  if (layout.pressure && pressureKpaAbs === undefined) return undefined;

  const result: ReadSample = { time, tempC };
  if (pressureKpaAbs !== undefined) result.pressureKpaAbs = pressureKpaAbs;
  if (layout.phase) {
    const label = row.fields[layout.phase.index].trim();
    if (label !== "") result.phase = label;
  }
  return result;
}

function unitLabel(unit: TemperatureUnit): string {
  return unit === "K" ? "K" : `°${unit}`;
}

// A plain decimal number; a decimal comma is accepted when columns are not comma-separated.
function parseNumber(value: string, delimiter: Delimiter): number | undefined {
  let v = value;
  if (delimiter !== ",") {
    const m = DECIMAL_COMMA.exec(v);
    if (m) v = `${m[1]}.${m[2]}`;
  }
  if (!NUMBER.test(v)) return undefined;
  const n = Number(v);
  return Number.isFinite(n) ? n : undefined;
}

// Seconds since the epoch for an ISO-8601 date-time with a zone designator.
function parseTimestamp(value: string): number | undefined {
  const m = TIMESTAMP.exec(value);
  if (!m) return undefined;
  const iso = `${m[1]}T${m[2].replace(",", ".")}${m[3].toUpperCase()}`;
  const date = parseISO(iso);
  return isValid(date) ? date.getTime() / 1000 : undefined;
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}
