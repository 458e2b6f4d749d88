// Statistics and Markdown tables shared by the benchmarks. (`npm run bench` runs every file in
// this folder except index.ts and those whose names start with "_", like this one.)

/** The middle value of xs (the mean of the two middle ones for an even count); NaN when empty. */
export function median(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  if (s.length === 0) return Number.NaN;
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : (s[m - 1]! + s[m]!) / 2;
}

/** The q-quantile of xs by nearest rank (0.99 is the 99th percentile); NaN when empty. */
export function quantile(xs: readonly number[], q: number): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.max(0, Math.ceil(q * s.length) - 1))] ?? Number.NaN;
}

/** A number with the thousands grouped (en-GB) and exactly `digits` decimals. */
export function fmt(n: number, digits = 0): string {
  return n.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });
}

/**
 * The lines of a Markdown table: the header, the alignment row and one line per row. `align` has
 * one letter per column: l (left), r (right, for numbers) or c (centred).
 */
export function markdownTable(columns: readonly string[], align: string, rows: readonly (readonly (string | number)[])[]): string[] {
  if (align.length !== columns.length || /[^lrc]/.test(align)) throw new Error(`markdownTable: give one of l, r or c for each of the ${columns.length} columns, not "${align}".`);
  const rule = { l: "---", r: "---:", c: ":-:" } as const;
  const line = (cells: readonly (string | number)[]) => `| ${cells.join(" | ")} |`;
  return [line(columns), line([...align].map((a) => rule[a as keyof typeof rule])), ...rows.map(line)];
}
