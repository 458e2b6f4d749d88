// The limits each monitoring reading is checked against and the interval of each recurring check,
// with the defaults and where they come from; the quality lead may change both (stored in
// monitoring_settings, merged over these defaults). Pure: no I/O.

/** The readings that have limits. */
export const LIMIT_KEYS = ["store_temperature", "store_humidity", "rinse_conductivity", "softened_hardness"] as const;
export type LimitKey = (typeof LIMIT_KEYS)[number];

/** A range; an empty end means no limit on that side. */
export interface Range {
  low: number | null;
  high: number | null;
}

export interface LimitInfo {
  label: string;
  unit: string;
  /** Where the default comes from. */
  source: string;
  /** The widest range a setting may take, to catch typing slips. */
  bounds: { min: number; max: number };
}

export const LIMIT_INFO: Record<LimitKey, LimitInfo> = {
  store_temperature: {
    label: "Sterile store temperature",
    unit: "°C",
    source: "18–20 °C, common practice (AAMI ST46 allows up to 24 °C)",
    bounds: { min: -10, max: 50 },
  },
  store_humidity: {
    label: "Sterile store relative humidity",
    unit: "%",
    source: "40–60 % RH, common practice (AAMI ST46: at most 60 %)",
    bounds: { min: 0, max: 100 },
  },
  rinse_conductivity: {
    label: "Final-rinse water conductivity",
    unit: "µS/cm",
    source: "at most 30 µS/cm at 25 °C (HTM 01-01 Part D, from memory; set the unit's own water specification)",
    bounds: { min: 0, max: 5000 },
  },
  softened_hardness: {
    label: "Hardness after softening",
    unit: "mmol/l",
    source: "at most 0.5 mmol/l (about 2.8 °dH), common practice for a working softener (from memory)",
    bounds: { min: 0, max: 10 },
  },
};

export const DEFAULT_LIMITS: Record<LimitKey, Range> = {
  store_temperature: { low: 18, high: 20 },
  store_humidity: { low: 40, high: 60 },
  rinse_conductivity: { low: null, high: 30 },
  softened_hardness: { low: null, high: 0.5 },
};

/** The recurring checks, each done at least once per its interval. */
export const CHECK_KEYS = ["seal_test", "store_climate", "washer_cleaning", "water_reading"] as const;
export type CheckKey = (typeof CHECK_KEYS)[number];

export interface CheckInfo {
  label: string;
  /** Whether the check is due for each active machine of a kind, or once for the unit. */
  per: "heat_sealer" | "washer" | "unit";
  source: string;
}

export const CHECK_INFO: Record<CheckKey, CheckInfo> = {
  seal_test: { label: "Heat sealer seal test", per: "heat_sealer", source: "daily, common practice (results filed; seal per EN 868-5)" },
  store_climate: { label: "Sterile store temperature and humidity", per: "unit", source: "daily, common practice" },
  washer_cleaning: { label: "Cleaning of wash arms and sieves", per: "washer", source: "weekly, common practice" },
  water_reading: { label: "Water treatment readings", per: "unit", source: "daily, common practice" },
};

/** Interval of each recurring check, in calendar days of the unit's time zone. */
export const DEFAULT_INTERVALS: Record<CheckKey, number> = {
  seal_test: 1,
  store_climate: 1,
  washer_cleaning: 7,
  water_reading: 1,
};

export interface MonitoringSettings {
  limits: Record<LimitKey, Range>;
  intervals: Record<CheckKey, number>;
}

export const DEFAULT_SETTINGS: MonitoringSettings = { limits: DEFAULT_LIMITS, intervals: DEFAULT_INTERVALS };

/** 1 °dH is 10 mg CaO per litre: 10 / 56.077 g/mol = 0.17833 mmol/l (computed from the definition of the German degree). */
export const MMOL_L_PER_DH = 10 / 56.077;

export function dhToMmolL(dh: number): number {
  return dh * MMOL_L_PER_DH;
}

export function mmolLToDh(mmolL: number): number {
  return mmolL / MMOL_L_PER_DH;
}

const num = (n: number) => (Number.isInteger(n) ? String(n) : String(Number(n.toFixed(2))));

/** A range as people read it: "18–20 °C", "at most 30 µS/cm", "at least 40 %", "no limit". */
export function describeRange(range: Range, unit: string): string {
  const u = unit === "%" ? " %" : ` ${unit}`;
  if (range.low !== null && range.high !== null) return `${num(range.low)}–${num(range.high)}${u}`;
  if (range.high !== null) return `at most ${num(range.high)}${u}`;
  if (range.low !== null) return `at least ${num(range.low)}${u}`;
  return "no limit";
}

/** Why a value is outside a range, as a sentence; null when it is inside (the ends count as inside). */
export function rangeFinding(key: LimitKey, value: number, range: Range): string | null {
  const info = LIMIT_INFO[key];
  const u = info.unit === "%" ? " %" : ` ${info.unit}`;
  if (range.low !== null && value < range.low) return `${info.label} ${num(value)}${u} is below the lower limit of ${num(range.low)}${u}.`;
  if (range.high !== null && value > range.high) return `${info.label} ${num(value)}${u} is above the upper limit of ${num(range.high)}${u}.`;
  return null;
}

/** The readings of one entry, in their stored units. */
export interface Readings {
  outcome?: "pass" | "fail" | null;
  temperatureC?: number | null;
  humidityPct?: number | null;
  conductivityUsCm?: number | null;
  hardnessMmolL?: number | null;
}

/** Every limit an entry's readings miss, as sentences (empty when all are inside). */
export function checkReadings(readings: Readings, limits: Record<LimitKey, Range>, kind: string): string[] {
  const findings: string[] = [];
  const add = (key: LimitKey, value: number | null | undefined) => {
    if (value === null || value === undefined) return;
    const finding = rangeFinding(key, value, limits[key]);
    if (finding) findings.push(finding);
  };
  if (kind === "store_climate") {
    add("store_temperature", readings.temperatureC);
    add("store_humidity", readings.humidityPct);
  }
  if (kind === "water_reading") {
    add("rinse_conductivity", readings.conductivityUsCm);
    add("softened_hardness", readings.hardnessMmolL);
  }
  if (kind === "seal_test" && readings.outcome === "fail") findings.push("The seal test failed.");
  return findings;
}

/** Checks settings are usable (a range's low end not above its high end, inside its bounds; intervals 1–366 days); the problems by field. */
export function settingsProblems(settings: MonitoringSettings): Record<string, string> {
  const problems: Record<string, string> = {};
  for (const key of LIMIT_KEYS) {
    const { low, high } = settings.limits[key];
    const { bounds, unit } = LIMIT_INFO[key];
    for (const [end, value] of [
      ["low", low],
      ["high", high],
    ] as const) {
      if (value !== null && (value < bounds.min || value > bounds.max)) {
        problems[`${key}.${end}`] = `Enter a value from ${bounds.min} to ${bounds.max} ${unit}.`;
      }
    }
    if (low !== null && high !== null && low > high) problems[`${key}.low`] = "The lower limit is above the upper limit.";
  }
  for (const key of CHECK_KEYS) {
    const days = settings.intervals[key];
    if (!Number.isInteger(days) || days < 1 || days > 366) problems[`intervals.${key}`] = "Enter whole days from 1 to 366.";
  }
  return problems;
}

/** Stored overrides merged over the defaults; anything unreadable falls back to its default. */
export function mergeSettings(stored: { key: string; value: string }[]): MonitoringSettings {
  const limits = { ...DEFAULT_LIMITS };
  const intervals = { ...DEFAULT_INTERVALS };
  for (const row of stored) {
    let value: unknown;
    try {
      value = JSON.parse(row.value);
    } catch {
      continue;
    }
    if (row.key.startsWith("limit:")) {
      const key = row.key.slice(6) as LimitKey;
      if (!LIMIT_KEYS.includes(key) || typeof value !== "object" || value === null) continue;
      const { low, high } = value as { low?: unknown; high?: unknown };
      const end = (v: unknown) => (typeof v === "number" && Number.isFinite(v) ? v : null);
      limits[key] = { low: end(low), high: end(high) };
    } else if (row.key.startsWith("interval:")) {
      const key = row.key.slice(9) as CheckKey;
      if (CHECK_KEYS.includes(key) && typeof value === "number" && Number.isInteger(value) && value >= 1) intervals[key] = value;
    }
  }
  return { limits, intervals };
}
