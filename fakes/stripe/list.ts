import { invalidParam } from "./errors";
import type { Params } from "./params";

// Stripe's list envelope and cursor paging.

export interface ApiList<T> {
  object: "list";
  data: T[];
  has_more: boolean;
  url: string;
}

export interface ListQuery {
  limit: number;
  startingAfter?: string;
  endingBefore?: string;
}

// Reads `limit` (1–100, default 10), `starting_after` and `ending_before`.
export function readListQuery(p: Params): ListQuery {
  const limit = p.integer("limit", { min: 1, max: 100 }) ?? 10;
  const startingAfter = p.string("starting_after") || undefined;
  const endingBefore = p.string("ending_before") || undefined;
  if (startingAfter && endingBefore) {
    throw invalidParam("You may only specify one of these parameters: ending_before, starting_after.", "ending_before");
  }
  return { limit, startingAfter, endingBefore };
}

/**
 * One page of `items`, which are already filtered and in list order (newest first for most
 * resources). `starting_after` pages forward from a cursor, `ending_before` backward; the
 * cursor must be an item of the filtered list.
 */
export function paginate<T extends { id: string }>(items: T[], q: ListQuery, url: string): ApiList<T> {
  if (q.startingAfter) {
    const at = indexOf(items, q.startingAfter, "starting_after");
    const data = items.slice(at + 1, at + 1 + q.limit);
    return { object: "list", data, has_more: at + 1 + q.limit < items.length, url };
  }
  if (q.endingBefore) {
    const at = indexOf(items, q.endingBefore, "ending_before");
    const from = Math.max(0, at - q.limit);
    return { object: "list", data: items.slice(from, at), has_more: from > 0, url };
  }
  return { object: "list", data: items.slice(0, q.limit), has_more: items.length > q.limit, url };
}

// A whole list in one envelope (the embedded `lines` of an invoice show their first page).
export function listOf<T>(data: T[], url: string, hasMore = false): ApiList<T> {
  return { object: "list", data, has_more: hasMore, url };
}

function indexOf<T extends { id: string }>(items: T[], id: string, param: string): number {
  const at = items.findIndex((x) => x.id === id);
  if (at < 0) {
    throw invalidParam(`Invalid ${param}: '${id}' is not an object of this list (with these filters)`, param, "resource_missing");
  }
  return at;
}

