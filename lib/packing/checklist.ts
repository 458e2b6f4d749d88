// The contents check at packing: the packer counts every line of the set's contents list and the
// damaged instruments in it; what is short or damaged becomes an irregularity, which either holds
// the set or is packed with it and printed on its label.
//
// Pure module: no I/O.

import { z } from "zod";

/** One line of a set type's contents list. */
export interface ContentsItem {
  position: number;
  name: string;
  quantity: number;
}

/** What the packer entered for one line; `counted` null means the line was not counted. */
export interface LineCount {
  position: number;
  counted: number | null;
  damaged: number;
}

/** One line as counted, as pack_records.counts keeps it. */
export interface CountedLine {
  position: number;
  name: string;
  expected: number;
  counted: number;
  damaged: number;
}

export const IRREGULARITY_KINDS = ["missing", "damaged"] as const;
export type IrregularityKind = (typeof IRREGULARITY_KINDS)[number];

/** Something short or damaged, as pack_records.irregularities keeps it. */
export interface Irregularity {
  name: string;
  kind: IrregularityKind;
  quantity: number;
}

export interface CountProblem {
  position: number;
  message: string;
}

export type CountCheck =
  | { ok: true; lines: CountedLine[]; irregularities: Irregularity[] }
  | { ok: false; uncounted: ContentsItem[]; problems: CountProblem[] };

/**
 * Compares the counts with the contents list. Every line must be counted (a blank is not a
 * zero); more than the list holds is refused (the extra instrument belongs to another set); no
 * more damaged than counted. Otherwise the lines as counted and the irregularities, in list order.
 */
export function checkCounts(items: readonly ContentsItem[], counts: readonly LineCount[]): CountCheck {
  const byPosition = new Map<number, LineCount>();
  const problems: CountProblem[] = [];
  for (const count of counts) {
    if (byPosition.has(count.position)) {
      problems.push({ position: count.position, message: `Line ${count.position} is counted twice: reload the set and count again.` });
    }
    byPosition.set(count.position, count);
  }
  const known = new Set(items.map((item) => item.position));
  for (const count of counts) {
    if (!known.has(count.position)) {
      problems.push({
        position: count.position,
        message: `Line ${count.position} is not on this set's contents list: the list has changed, scan the set again.`,
      });
    }
  }
  const uncounted: ContentsItem[] = [];
  const lines: CountedLine[] = [];
  const missing: Irregularity[] = [];
  const damaged: Irregularity[] = [];
  for (const item of items) {
    const count = byPosition.get(item.position);
    if (!count || count.counted === null) {
      uncounted.push(item);
      continue;
    }
    if (count.counted > item.quantity) {
      problems.push({
        position: item.position,
        message: `${count.counted} counted of ${item.name}, but the set holds ${item.quantity}: take out the extra instrument (it belongs to another set) and count again.`,
      });
      continue;
    }
    if (count.damaged > count.counted) {
      problems.push({
        position: item.position,
        message: `${count.damaged} damaged of ${item.name}, but only ${count.counted} counted: the damaged ones are counted too.`,
      });
      continue;
    }
    lines.push({ position: item.position, name: item.name, expected: item.quantity, counted: count.counted, damaged: count.damaged });
    if (count.counted < item.quantity) missing.push({ name: item.name, kind: "missing", quantity: item.quantity - count.counted });
    if (count.damaged > 0) damaged.push({ name: item.name, kind: "damaged", quantity: count.damaged });
  }
  if (uncounted.length > 0 || problems.length > 0) return { ok: false, uncounted, problems };
  return { ok: true, lines, irregularities: [...missing, ...damaged] };
}

/** "1 × Needle holder, Mayo-Hegar 160 mm missing" */
export function irregularityText(irregularity: Irregularity): string {
  return `${irregularity.quantity} × ${irregularity.name} ${irregularity.kind}`;
}

/** The reason a set is held for its irregularities: "Missing: 1 × Needle holder, Mayo-Hegar 160 mm". */
export function holdReasonFor(irregularities: readonly Irregularity[]): string {
  const group = (kind: IrregularityKind, caption: string) => {
    const of = irregularities.filter((i) => i.kind === kind);
    return of.length ? `${caption}: ${of.map((i) => `${i.quantity} × ${i.name}`).join("; ")}` : null;
  };
  return [group("missing", "Missing"), group("damaged", "Damaged")].filter(Boolean).join(". ");
}

/** The line printed on the label of a set packed with irregularities, or null when it has none. */
export function labelIrregularityText(irregularities: readonly Irregularity[]): string | null {
  if (irregularities.length === 0) return null;
  const caption = irregularities.length === 1 ? "IRREGULARITY" : "IRREGULARITIES";
  return `${caption}: ${irregularities.map(irregularityText).join("; ")}`;
}

/** How many instruments are short, over all irregularities. */
export function missingCount(irregularities: readonly Irregularity[]): number {
  return irregularities.filter((i) => i.kind === "missing").reduce((sum, i) => sum + i.quantity, 0);
}

// The JSON columns of pack_records, read back at the data-access boundary.
const countedLinesSchema = z.array(
  z.object({
    position: z.number().int().optional(),
    name: z.string(),
    expected: z.number().int(),
    counted: z.number().int(),
    damaged: z.number().int(),
  }),
);
const irregularitiesSchema = z.array(z.object({ name: z.string(), kind: z.enum(IRREGULARITY_KINDS), quantity: z.number().int() }));

/** pack_records.counts as stored. Throws on a value we did not write: a label must not print a guess. */
export function parseCountedLines(json: string): CountedLine[] {
  const parsed = countedLinesSchema.safeParse(safeJson(json));
  if (!parsed.success) throw new Error("A packing record's counts cannot be read.");
  return parsed.data.map((line, index) => ({ ...line, position: line.position ?? index + 1 }));
}

/** pack_records.irregularities as stored. Throws on a value we did not write, never hiding one. */
export function parseIrregularities(json: string): Irregularity[] {
  const parsed = irregularitiesSchema.safeParse(safeJson(json));
  if (!parsed.success) throw new Error("A packing record's irregularities cannot be read.");
  return parsed.data;
}

function safeJson(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    return undefined;
  }
}
