// Reads the header row of a cycle record: which column holds what, in which unit.
//
// Accepted headers (case-insensitive; spaces, underscores and brackets separate the parts;
// a degree sign is optional):
//   elapsed time in seconds   t_s · seconds · elapsed_s · time_s · time (s)
//   ISO-8601 timestamps       timestamp · time · datetime, optionally with (UTC); each value
//                             must carry Z or an offset, e.g. 2026-03-02T07:15:00+01:00
//   temperature               temp or temperature, with the unit: _c · _f · _k · (°C) · (°F) · (K)
//   pressure                  pressure or p, with unit and reference: kPa, bar, mbar, MPa or psi,
//                             then abs / a / absolute or g / gauge — e.g. pressure_kpa_abs,
//                             pressure (bar g), p_barg, pressure_psig. mbar without a
//                             reference is read as absolute, the usual way chamber vacuum
//                             is shown (common practice).
//   Gauge readings become absolute by adding the atmosphere: 101.325 kPa (standard atmosphere)
//   unless the caller passes the unit's own barometric pressure.
//   stage label               phase · stage
// Any other header is ignored and listed in the record's ignoredColumns.

import type { PressureReference, PressureUnit, TemperatureUnit } from "./record";

export type HeaderRole =
  | { role: "time"; kind: "elapsed_seconds" | "timestamp" }
  | { role: "temperature"; unit: TemperatureUnit }
  | { role: "pressure"; unit: PressureUnit; reference: PressureReference | undefined }
  | { role: "phase" }
  | { role: "ignored" }
  /** The header names a known quantity but its unit cannot be used; `message` says what to write. */
  | { role: "unknown_unit"; quantity: "time" | "temperature" | "pressure"; message: string };

const TIME_NAMES = new Set(["t", "time", "elapsed"]);
const SECOND_UNITS = new Set(["s", "sec", "secs", "second", "seconds"]);
const TIMESTAMP_NAMES = new Set(["timestamp", "time", "datetime"]);
const TEMPERATURE_NAMES = new Set(["temp", "temperature"]);
const PRESSURE_NAMES = new Set(["p", "pressure"]);
const PHASE_NAMES = new Set(["phase", "stage"]);

const TEMPERATURE_UNITS: Record<string, TemperatureUnit> = {
  c: "C",
  degc: "C",
  celsius: "C",
  f: "F",
  degf: "F",
  fahrenheit: "F",
  k: "K",
  kelvin: "K",
};

const PRESSURE_UNITS: Record<string, PressureUnit> = { kpa: "kPa", bar: "bar", mbar: "mbar", mpa: "MPa", psi: "psi" };
const ABSOLUTE = new Set(["a", "abs", "absolute"]);
const GAUGE = new Set(["g", "gauge"]);

/** Splits a header into lower-case words: "Temperature (°C)" → ["temperature", "c"]. */
export function headerWords(header: string): string[] {
  return header
    .toLowerCase()
    .replace(/[°º]/g, "")
    .split(/[\s_()[\]/,.-]+/)
    .filter((w) => w.length > 0);
}

// Decides what a header column holds.
export function classifyHeader(header: string): HeaderRole {
  const words = headerWords(header);
  if (words.length === 0) return { role: "ignored" };
  const [name, ...unitWords] = words;

  if (unitWords.length === 0) {
    if (name === "seconds") return { role: "time", kind: "elapsed_seconds" };
    if (TIMESTAMP_NAMES.has(name)) return { role: "time", kind: "timestamp" };
    if (PHASE_NAMES.has(name)) return { role: "phase" };
    if (TEMPERATURE_NAMES.has(name)) {
      return {
        role: "unknown_unit",
        quantity: "temperature",
        message: `the temperature column "${header}" does not say its unit; name it temp_c (°C) or temp_f (°F)`,
      };
    }
    if (PRESSURE_NAMES.has(name)) {
      return {
        role: "unknown_unit",
        quantity: "pressure",
        message: `the pressure column "${header}" does not say its unit; name it e.g. pressure_kpa_abs, pressure_kpa_g, pressure_bar_abs, pressure_bar_g or pressure_mbar`,
      };
    }
    return { role: "ignored" };
  }

  if (TIMESTAMP_NAMES.has(name) && unitWords.length === 1 && unitWords[0] === "utc") {
    return { role: "time", kind: "timestamp" };
  }

  if (TIME_NAMES.has(name)) {
    if (unitWords.length === 1 && SECOND_UNITS.has(unitWords[0])) return { role: "time", kind: "elapsed_seconds" };
    return {
      role: "unknown_unit",
      quantity: "time",
      message: `the time column "${header}" uses a unit that is not accepted; give elapsed seconds in a column named t_s, or ISO-8601 timestamps in a column named timestamp`,
    };
  }

  if (TEMPERATURE_NAMES.has(name)) {
    const unit = unitWords.length === 1 ? TEMPERATURE_UNITS[unitWords[0]] : undefined;
    if (unit) return { role: "temperature", unit };
    return {
      role: "unknown_unit",
      quantity: "temperature",
      message: `the temperature unit in "${header}" is not known; use temp_c (°C), temp_f (°F) or temp_k (K)`,
    };
  }

  if (PRESSURE_NAMES.has(name)) {
    const parsed = pressureUnit(unitWords);
    if (parsed && (parsed.reference !== undefined || parsed.unit === "mbar")) {
      return { role: "pressure", unit: parsed.unit, reference: parsed.reference ?? "absolute" };
    }
    const what = parsed
      ? `does not say whether "${header}" is absolute or gauge`
      : `the pressure unit in "${header}" is not known`;
    return {
      role: "unknown_unit",
      quantity: "pressure",
      message: `${what}; name the column e.g. pressure_kpa_abs, pressure_kpa_g, pressure_bar_abs, pressure_bar_g or pressure_mbar`,
    };
  }

  return { role: "ignored" };
}

function pressureUnit(words: string[]): { unit: PressureUnit; reference: PressureReference | undefined } | undefined {
  if (words.length === 0 || words.length > 2) return undefined;
  const joined = /^(kpa|bar|mbar|mpa|psi)(a|g)?$/.exec(words[0]);
  if (!joined) return undefined;
  const unit = PRESSURE_UNITS[joined[1]];
  let reference: PressureReference | undefined = joined[2] === "a" ? "absolute" : joined[2] === "g" ? "gauge" : undefined;
  if (words.length === 2) {
    if (reference !== undefined) return undefined;
    if (ABSOLUTE.has(words[1])) reference = "absolute";
    else if (GAUGE.has(words[1])) reference = "gauge";
    else return undefined;
  }
  return { unit, reference };
}
