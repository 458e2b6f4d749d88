// Writes a CycleRecord as CSV in the layout parseWasherRecord / parseSterilizerRecord read.

import Papa from "papaparse";
import { STANDARD_ATMOSPHERE_KPA, type CycleRecord, type PressureReference, type PressureUnit, type TemperatureUnit } from "./record";
import { fromCelsius, fromKpaAbsolute } from "./units";

export interface CycleCsvOptions {
  /** Defaults to °C. */
  temperatureUnit?: TemperatureUnit;
  /** Defaults to kPa absolute. */
  pressure?: { unit: PressureUnit; reference: PressureReference; atmosphereKpa?: number };
  /**
   * ISO-8601 time of the first sample. When given (or when the record has startedAt) the file has
   * a `timestamp` column instead of elapsed seconds in `t_s`.
   */
  startedAt?: string;
  /** Decimal places for temperatures and pressures; full precision by default. */
  decimals?: number;
  /** Leaves out the pressure column even when the samples carry pressure. */
  omitPressure?: boolean;
}

// The CSV text of a record, with a header row and one row per sample.
export function recordToCsv(record: CycleRecord, opts: CycleCsvOptions = {}): string {
  const tempUnit = opts.temperatureUnit ?? "C";
  const pressure = opts.pressure ?? { unit: "kPa", reference: "absolute" };
  const atmosphereKpa = pressure.atmosphereKpa ?? STANDARD_ATMOSPHERE_KPA;
  const startedAt = opts.startedAt ?? record.startedAt;
  const startMs = startedAt === undefined ? undefined : Date.parse(startedAt);
  if (startMs !== undefined && Number.isNaN(startMs)) throw new RangeError(`startedAt is not an ISO-8601 time: "${startedAt}"`);
  if (opts.decimals !== undefined && !(Number.isInteger(opts.decimals) && opts.decimals >= 0 && opts.decimals <= 12)) {
    throw new RangeError(`decimals must be a whole number from 0 to 12, got ${opts.decimals}`);
  }
  const round = (n: number) => (opts.decimals === undefined ? n : Number(n.toFixed(opts.decimals)));

  const withPressure = !opts.omitPressure && record.samples.some((s) => s.pressureKpaAbs !== undefined);
  const withPhase = record.samples.some((s) => s.phase !== undefined);
  const fields = [
    startMs === undefined ? "t_s" : "timestamp",
    `temp_${tempUnit.toLowerCase()}`,
    ...(withPressure ? [pressureHeader(pressure.unit, pressure.reference)] : []),
    ...(withPhase ? ["phase"] : []),
  ];
  const data = record.samples.map((s) => {
    const row: (string | number)[] = [
      startMs === undefined ? s.t : new Date(startMs + s.t * 1000).toISOString(),
      round(fromCelsius(s.tempC, tempUnit)),
    ];
    if (withPressure) {
      row.push(
        s.pressureKpaAbs === undefined
          ? ""
          : round(fromKpaAbsolute(s.pressureKpaAbs, pressure.unit, pressure.reference, atmosphereKpa)),
      );
    }
    if (withPhase) row.push(s.phase ?? "");
    return row;
  });
  return Papa.unparse({ fields, data });
}

function pressureHeader(unit: PressureUnit, reference: PressureReference): string {
  return `pressure_${unit.toLowerCase()}_${reference === "absolute" ? "abs" : "g"}`;
}
