// The layout of a set's label, shared by the printable page and the PDF so both show the same
// thing: a 100 × 50 mm label, or 100 × 150 mm when it carries the contents list.
//
// Pure module: no I/O.

export const LABEL_WIDTH_MM = 100;
export const LABEL_HEIGHT_MM = 50;
export const LABEL_WITH_CONTENTS_HEIGHT_MM = 150;

/** Rows of the contents list in the lower 100 mm, 3 mm each. */
export const CONTENTS_ROWS = 30;

/** Lines of the contents list that fit in the lower 100 mm: two columns of 30. */
export const CONTENTS_CAPACITY = 2 * CONTENTS_ROWS;

/** The captions of the boxes filled from the cycle as it is packed and sterilised (blank before). */
export const LABEL_BLANK_FIELDS = ["Packed by", "Load", "Sterilised on", "Use by"] as const;
export type LabelFieldCaption = (typeof LABEL_BLANK_FIELDS)[number];

/**
 * What one cycle puts on its set's label, ready to print (dates already in the unit's time
 * zone). Null fields print as blank boxes, to be written in by hand.
 *
 * The DataMatrix carries the set's GIAI (8004) alone, also once the set is sterilised. The
 * expiry is printed as text in "Use by", not encoded as AI (17): the GS1 General Specifications
 * allow (17) only together with a trade item key — (01), (02), (255), (8006) or (8026), as
 * lib/labels/gs1.ts encodes the mandatory associations — and a GIAI is not one, so the encoder
 * refuses the pair. A scan of the GIAI finds the cycle, whose record holds the expiry; a date
 * inside the symbol could not be corrected after a recall or a change of shelf life anyway.
 */
export interface LabelCycleFields {
  cycleId: number;
  /** The packer's name. */
  packedBy: string | null;
  /** "2 Dec 2026 10:15" */
  packedAt: string | null;
  /** The packaging of this pack in words ("Double pouch"). */
  packaging: string | null;
  /** The steriliser load's number; blank until the load is recorded. */
  load: string | null;
  /** "3 Dec 2026" */
  sterilisedOn: string | null;
  /** "3 Jun 2027" */
  useBy: string | null;
  /** "IRREGULARITY: 1 × Needle holder, Mayo-Hegar 160 mm missing", when packed with one. */
  irregularity: string | null;
  /** Per contents line name, what was short or damaged ("1 missing"), for the contents list. */
  lineNotes: Record<string, string>;
}

/** The lines printed in each box, from the cycle's fields; no lines leaves the box blank. */
export function labelFieldLines(fields: LabelCycleFields | null): Record<LabelFieldCaption, string[]> {
  const lines = (...values: (string | null | undefined)[]) => values.filter((v): v is string => !!v);
  return {
    "Packed by": lines(fields?.packedBy, fields?.packedAt),
    Load: lines(fields?.load),
    "Sterilised on": lines(fields?.sterilisedOn),
    "Use by": lines(fields?.useBy),
  };
}

const MONTHS = ["Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"] as const;

/** A local calendar date as the label prints it: "2026-06-03" → "3 Jun 2026"; null for anything else. */
export function labelDate(localDate: string | null): string | null {
  const match = localDate ? /^(\d{4})-(\d{2})-(\d{2})$/.exec(localDate) : null;
  if (!match) return null;
  const month = MONTHS[Number(match[2]) - 1];
  const day = Number(match[3]);
  if (!month || day < 1 || day > 31) return null;
  return `${day} ${month} ${match[1]}`;
}

export interface ContentsLine {
  name: string;
  quantity: number;
}

export interface ContentsLayout<L extends ContentsLine> {
  /** The lines printed, in catalogue order. */
  shown: L[];
  /** How many lines did not fit; the label then says so instead of printing a partial list silently. */
  hidden: number;
  /** Instruments in the whole set (the sum of the quantities), whether or not every line fits. */
  instruments: number;
  /** One full-width column while the list fits in one, else two. */
  columns: 1 | 2;
}

/** Which contents lines fit on the label; when some do not, the last place says how many are left out. */
export function layoutContents<L extends ContentsLine>(lines: readonly L[], capacity = CONTENTS_CAPACITY): ContentsLayout<L> {
  const instruments = lines.reduce((sum, line) => sum + line.quantity, 0);
  const columns = lines.length <= CONTENTS_ROWS ? 1 : 2;
  if (lines.length <= capacity) return { shown: [...lines], hidden: 0, instruments, columns };
  const shown = lines.slice(0, Math.max(0, capacity - 1));
  return { shown, hidden: lines.length - shown.length, instruments, columns };
}

/** "24 instruments on 12 lines" */
export function contentsSummary(instruments: number, lines: number): string {
  const i = `${instruments} instrument${instruments === 1 ? "" : "s"}`;
  const l = `${lines} line${lines === 1 ? "" : "s"}`;
  return `${i} on ${l}`;
}

/** The note in the last place of a list that did not fit: the count, then the words. */
export function moreLinesNote(hidden: number): { count: string; text: string } {
  return { count: `+${hidden}`, text: `more line${hidden === 1 ? "" : "s"}: see the catalogue` };
}
