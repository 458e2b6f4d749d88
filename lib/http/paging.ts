import { type SelectQueryBuilder, sql } from "kysely";
import { z } from "zod";

// Server-side paging, sorting and searching for the tables that fetch through route handlers.

/** The query-string schema of a paged list: page, pageSize, sort (one of `sorts`), dir and q. */
export function listQuerySchema<const S extends readonly [string, ...string[]], E extends z.ZodRawShape = Record<never, never>>(
  sorts: S,
  extra?: E,
) {
  return z.object({
    page: z.coerce.number().int().min(1).max(100_000).default(1),
    pageSize: z.coerce.number().int().min(1).max(200).default(25),
    sort: z.enum(sorts).default(sorts[0] as S[number]),
    dir: z.enum(["asc", "desc"]).default("asc"),
    q: z.string().trim().max(100).optional(),
    ...(extra ?? ({} as E)),
  });
}

export interface Page<R> {
  rows: R[];
  total: number;
}

/** A LIKE pattern that matches the text literally anywhere; use with `escape '\'`. */
export function likeContains(text: string): string {
  return `%${text.replaceAll("\\", "\\\\").replaceAll("%", "\\%").replaceAll("_", "\\_")}%`;
}

/**
 * A WHERE term: any of the columns contains the text, ignoring case. Both sides are lowered so
 * the term reads the same on SQLite (whose LIKE ignores ASCII case) and PostgreSQL (whose LIKE
 * does not).
 */
export function searchTerm(columns: string[], text: string) {
  const pattern = likeContains(text);
  return sql<boolean>`(${sql.join(
    columns.map((c) => sql`lower(${sql.ref(c)}) like lower(${pattern}) escape '\\'`),
    sql` or `,
  )})`;
}

/**
 * Counts the filtered base query, then selects one sorted page of it. `select` adds the columns;
 * `sortColumn` is a column reference chosen from a fixed map, never the caller's text.
 */
export async function fetchPage<DB, TB extends keyof DB, O, R>(
  base: SelectQueryBuilder<DB, TB, O>,
  select: (qb: SelectQueryBuilder<DB, TB, O>) => SelectQueryBuilder<DB, TB, R>,
  query: { page: number; pageSize: number; dir: "asc" | "desc" },
  sortColumn: string,
  tieBreaker: string,
): Promise<Page<R>> {
  const counted = await base
    .clearSelect()
    .select(sql<number>`count(*)`.as("total"))
    .executeTakeFirst();
  const rows = await select(base)
    .orderBy(sql.ref(sortColumn), query.dir)
    .orderBy(sql.ref(tieBreaker))
    .limit(query.pageSize)
    .offset((query.page - 1) * query.pageSize)
    .execute();
  return { rows, total: Number((counted as { total?: number } | undefined)?.total ?? 0) };
}
