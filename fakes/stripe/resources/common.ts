import type Stripe from "stripe";
import type { Ctx } from "../context";
import { invalidParam, noSuch } from "../errors";
import type { Params } from "../params";
import type { Row } from "../state";

// Helpers shared by the resource modules.

export type Handler = (ctx: Ctx, p: Params, path: Record<string, string>) => object;

// The row with this id, or Stripe's 404 ("No such invoice: 'in_…'").
export function rowOf<R>(map: Map<string, R>, id: string, noun: string, param = "id"): R {
  const row = map.get(id);
  if (!row) throw noSuch(noun, id, param);
  return row;
}

/** Metadata after an update: null clears everything, a key posted with "" is removed. */
export function mergeMetadata(current: Stripe.Metadata | null, update: Record<string, string> | null | undefined): Stripe.Metadata {
  if (update === undefined) return { ...(current ?? {}) };
  if (update === null) return {};
  const out: Stripe.Metadata = { ...(current ?? {}) };
  for (const [k, v] of Object.entries(update)) {
    if (v === "") delete out[k];
    else out[k] = v;
  }
  return out;
}

// Metadata given at creation (empty values are simply left out).
export function newMetadata(given: Record<string, string> | null | undefined): Stripe.Metadata {
  return mergeMetadata({}, given);
}

// A three-letter ISO currency code, lower-cased as Stripe returns it.
export function readCurrency(p: Params, key = "currency"): string | undefined {
  const v = p.string(key);
  if (v === undefined) return undefined;
  if (!/^[A-Za-z]{3}$/.test(v)) throw invalidParam(`Invalid currency: ${v}. Use a three-letter ISO code such as eur.`, p.nameOf(key));
  return v.toLowerCase();
}

export function readAddress(p: Params, key = "address"): Stripe.Address | null | undefined {
  if (p.isBlank(key)) {
    p.ignore(key);
    return null;
  }
  const a = p.object(key);
  if (!a) return undefined;
  const address: Stripe.Address = {
    city: a.string("city") ?? null,
    country: a.string("country") ?? null,
    line1: a.string("line1") ?? null,
    line2: a.string("line2") ?? null,
    postal_code: a.string("postal_code") ?? null,
    state: a.string("state") ?? null,
  };
  a.done();
  return address;
}

// A deep copy of a stored object, safe to hand out and to expand in place.
export function copy<T>(obj: T): T {
  return structuredClone(obj);
}

export function plainRows<T>(rows: Row<T>[]): T[] {
  return rows.map((r) => copy(r.obj));
}
