// The shape of a machine's time/temperature(/pressure) record once parsed, shared by the washer
// and steriliser checks.

export interface CycleSample {
  /** Seconds from the first sample of the record (the first sample is at 0). */
  t: number;
  /** Temperature in °C. */
  tempC: number;
  /** Chamber pressure in kPa absolute (steriliser records). */
  pressureKpaAbs?: number;
  /** The machine's stage label for this sample, as written in the record (trimmed). */
  phase?: string;
}

export type TemperatureUnit = "C" | "F" | "K";
export type PressureUnit = "kPa" | "bar" | "mbar" | "MPa" | "psi";
export type PressureReference = "absolute" | "gauge";

/** Which column of the file supplied each quantity, and how it was read. */
export interface CycleRecordColumns {
  time: { header: string; kind: "elapsed_seconds" | "timestamp" };
  temperature: { header: string; unit: TemperatureUnit };
  pressure?: { header: string; unit: PressureUnit; reference: PressureReference; atmosphereKpa: number };
  phase?: { header: string };
}

export interface CycleRecord {
  samples: CycleSample[];
  /** ISO-8601 UTC time of the first sample, when the file carried timestamps. */
  startedAt?: string;
  columns?: CycleRecordColumns;
  /** Headers present in the file that no check uses (e.g. a second probe). */
  ignoredColumns?: string[];
}

/** Standard atmosphere (ISO 2533), used to turn gauge readings into absolute pressure. */
export const STANDARD_ATMOSPHERE_KPA = 101.325;
