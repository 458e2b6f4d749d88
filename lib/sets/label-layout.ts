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

/** The captions of the lines left blank until the set is packed and sterilised. */
export const LABEL_BLANK_FIELDS = ["Packed by", "Load", "Sterilised on", "Use by"] as const;

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
