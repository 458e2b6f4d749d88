import { invalidParam } from "./errors";

// Typed readers over a form body or query string parsed by qs. Every value arrives as a string
// (or a nested object/array of strings); each reader checks one parameter, names it in its error
// like Stripe does (`lines[0][amount]`), and marks it as read so `done()` can refuse the rest.

export type RawParams = Record<string, unknown>;

export interface RangeFilter {
  gt?: number;
  gte?: number;
  lt?: number;
  lte?: number;
}

const INTEGER = /^-?\d+$/;
const DECIMAL = /^-?\d+(\.\d{1,12})?$/;

export class Params {
  private readonly used = new Set<string>();

  constructor(
    private readonly raw: RawParams,
    private readonly prefix = "",
  ) {}

  // Wraps any parsed value; a non-object (e.g. `metadata=abc`) is refused with the parameter named.
  static from(value: unknown, prefix = ""): Params {
    if (value === undefined || value === "") return new Params({}, prefix);
    if (!isPlainObject(value)) throw invalidParam(`Invalid object: ${prefix || "body"} must be a hash`, prefix || "body");
    return new Params(value, prefix);
  }

  /** The full name of a parameter as Stripe prints it. */
  nameOf(key: string): string {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    return this.raw[key] !== undefined;
  }

  /** True when the parameter was posted with an empty value (Stripe's "unset"). */
  isBlank(key: string): boolean {
    return this.raw[key] === "";
  }

  /** Marks a key as read without reading it (parameters accepted and ignored on purpose). */
  ignore(...keys: string[]): void {
    for (const k of keys) this.used.add(k);
  }

  private take(key: string): unknown {
    this.used.add(key);
    return this.raw[key];
  }

  string(key: string, options: { maxLength?: number } = {}): string | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (typeof v !== "string") throw invalidParam(`Invalid string: ${this.nameOf(key)} must be a string`, this.nameOf(key));
    const max = options.maxLength ?? 5000;
    if (v.length > max) {
      throw invalidParam(`Invalid string: ${this.nameOf(key)} must be at most ${max} characters long`, this.nameOf(key));
    }
    return v;
  }

  requiredString(key: string, options: { maxLength?: number } = {}): string {
    const v = this.string(key, options);
    if (v === undefined || v === "") throw missing(this.nameOf(key));
    return v;
  }

  /** A string that may be cleared by posting an empty value: "" reads as null. */
  emptyableString(key: string, options: { maxLength?: number } = {}): string | null | undefined {
    const v = this.string(key, options);
    if (v === undefined) return undefined;
    return v === "" ? null : v;
  }

  integer(key: string, options: { min?: number; max?: number } = {}): number | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    const name = this.nameOf(key);
    if (typeof v !== "string" || !INTEGER.test(v)) throw invalidParam(`Invalid integer: ${show(v)}`, name, "parameter_invalid_integer");
    const n = Number(v);
    if (!Number.isSafeInteger(n)) throw invalidParam(`Invalid integer: ${v} is out of range`, name, "parameter_invalid_integer");
    if (options.min !== undefined && n < options.min) {
      throw invalidParam(`Invalid ${name}: must be greater than or equal to ${options.min}`, name, "parameter_invalid_integer");
    }
    if (options.max !== undefined && n > options.max) {
      throw invalidParam(`Invalid ${name}: must be less than or equal to ${options.max}`, name, "parameter_invalid_integer");
    }
    return n;
  }

  requiredInteger(key: string, options: { min?: number; max?: number } = {}): number {
    const v = this.integer(key, options);
    if (v === undefined) throw missing(this.nameOf(key));
    return v;
  }

  boolean(key: string): boolean | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (v === "true") return true;
    if (v === "false") return false;
    throw invalidParam(`Invalid boolean: ${show(v)}`, this.nameOf(key));
  }

  enumOf<T extends string>(key: string, values: readonly T[]): T | undefined {
    const v = this.string(key);
    if (v === undefined) return undefined;
    if (!(values as readonly string[]).includes(v)) {
      throw invalidParam(`Invalid ${this.nameOf(key)}: must be one of ${values.join(", ")}`, this.nameOf(key));
    }
    return v as T;
  }

  /** A decimal string such as "1250.5" (Stripe's `*_decimal` parameters), normalised. */
  decimal(key: string): string | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (typeof v !== "string" || !DECIMAL.test(v)) {
      throw invalidParam(`Invalid decimal: ${show(v)} (at most 12 decimal places)`, this.nameOf(key));
    }
    return normaliseDecimal(v);
  }

  /** An id that must start with one of the prefixes. */
  id(key: string, prefixes: readonly string[]): string | undefined {
    const v = this.string(key, { maxLength: 255 });
    if (v === undefined || v === "") return undefined;
    if (!prefixes.some((p) => v.startsWith(p))) {
      throw invalidParam(`Invalid ${this.nameOf(key)}: '${v}' is not an id of the expected kind (${prefixes.join(", ")}…)`, this.nameOf(key));
    }
    return v;
  }

  /**
   * Metadata: up to 50 keys of at most 40 characters, values of at most 500 characters (Stripe's
   * documented limits). `metadata=""` reads as null ("clear all"); a key posted with "" is kept as
   * "" so an update can remove it.
   */
  metadata(key = "metadata"): Record<string, string> | null | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (v === "") return null;
    const name = this.nameOf(key);
    if (!isPlainObject(v)) throw invalidParam(`Invalid ${name}: must be a hash of string keys and values`, name);
    const entries = Object.entries(v);
    if (entries.length > 50) throw invalidParam(`Invalid ${name}: at most 50 keys are allowed`, name);
    const out: Record<string, string> = {};
    for (const [k, val] of entries) {
      if (k.length > 40) throw invalidParam(`Invalid ${name}: key '${k.slice(0, 40)}…' is longer than 40 characters`, `${name}[${k}]`);
      if (typeof val !== "string") throw invalidParam(`Invalid ${name}[${k}]: must be a string`, `${name}[${k}]`);
      if (val.length > 500) throw invalidParam(`Invalid ${name}[${k}]: values are at most 500 characters`, `${name}[${k}]`);
      out[k] = val;
    }
    return out;
  }

  object(key: string): Params | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (!isPlainObject(v)) throw invalidParam(`Invalid object: ${this.nameOf(key)} must be a hash`, this.nameOf(key));
    return new Params(v, this.nameOf(key));
  }

  /** An array of hashes (`lines[0][amount]=…`). */
  objectArray(key: string): Params[] | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    return asArray(v, this.nameOf(key)).map((item, i) => {
      const name = `${this.nameOf(key)}[${i}]`;
      if (!isPlainObject(item)) throw invalidParam(`Invalid object: ${name} must be a hash`, name);
      return new Params(item, name);
    });
  }

  stringArray(key: string): string[] | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (v === "") return [];
    return asArray(v, this.nameOf(key)).map((item, i) => {
      if (typeof item !== "string") throw invalidParam(`Invalid string: ${this.nameOf(key)}[${i}] must be a string`, `${this.nameOf(key)}[${i}]`);
      return item;
    });
  }

  /** A timestamp filter: `created=123` or `created[gte]=123&created[lt]=456`. */
  range(key: string): RangeFilter | undefined {
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (typeof v === "string") {
      const n = this.integer(key);
      return n === undefined ? undefined : { gte: n, lte: n };
    }
    const p = this.object(key);
    if (!p) return undefined;
    const r: RangeFilter = { gt: p.integer("gt"), gte: p.integer("gte"), lt: p.integer("lt"), lte: p.integer("lte") };
    p.done();
    return r;
  }

  /** Refuses any parameter no reader asked for, as Stripe does. */
  done(): void {
    for (const key of Object.keys(this.raw)) {
      if (!this.used.has(key) && this.raw[key] !== undefined) {
        throw invalidParam(
          `Received unknown parameter: ${this.nameOf(key)}. This local fake serves a subset of the Stripe API (see fakes/stripe/README.md).`,
          this.nameOf(key),
          "parameter_unknown",
        );
      }
    }
  }
}

// True when `t` falls inside the filter.
export function inRange(t: number, r: RangeFilter | undefined): boolean {
  if (!r) return true;
  if (r.gt !== undefined && !(t > r.gt)) return false;
  if (r.gte !== undefined && !(t >= r.gte)) return false;
  if (r.lt !== undefined && !(t < r.lt)) return false;
  if (r.lte !== undefined && !(t <= r.lte)) return false;
  return true;
}

export function missing(name: string) {
  return invalidParam(`Missing required param: ${name}.`, name, "parameter_missing");
}

export function isPlainObject(v: unknown): v is RawParams {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

// qs gives an array for dense indices and an object for sparse or large ones; both are accepted.
function asArray(v: unknown, name: string): unknown[] {
  if (Array.isArray(v)) return v;
  if (isPlainObject(v) && Object.keys(v).every((k) => INTEGER.test(k))) {
    return Object.keys(v)
      .sort((a, b) => Number(a) - Number(b))
      .map((k) => v[k]);
  }
  throw invalidParam(`Invalid array: ${name} must be an array (${name}[0]=…)`, name);
}

function show(v: unknown): string {
  return typeof v === "string" ? v : JSON.stringify(v);
}

// "0012.50" → "12.5", "-0" → "0".
export function normaliseDecimal(v: string): string {
  const negative = v.startsWith("-");
  const [intPart, frac = ""] = (negative ? v.slice(1) : v).split(".");
  const i = intPart.replace(/^0+(?=\d)/, "");
  const f = frac.replace(/0+$/, "");
  const s = f ? `${i}.${f}` : i;
  return negative && s !== "0" ? `-${s}` : s;
}
