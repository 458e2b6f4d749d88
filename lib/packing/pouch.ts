// Which flat pouch to use for an instrument: the smallest one in the unit's list that holds it
// within the fill and clearance rules, explained in words, or why none does. For double pouching
// the item goes in an inner pouch, and the inner pouch in an outer one.
//
// The rules (shared CHECKS.md):
// - At most three quarters of the pouch's inner length filled (ISO/TS 16775: at most 75 %).
// - About 2 cm clear around the instrument (common practice).
// - Seals at least 6 mm wide (EN 868-5); the inner size is the flat size less a seal at each edge.
// - Double pouching: the inner pouch lies flat in the outer one, unfolded, with its edges clear of
//   the outer pouch's seals (common practice, from memory; the clearance below is our choice).
//
// Geometry (computed): a flat pouch wraps round the item's cross-section, whose perimeter is
// 2 × (width + thickness), while the pouch's inner perimeter is 2 × inner width. So a thick
// instrument needs an inner width of width + thickness, and along the length, length + thickness.
// With the clearance on each side and the length filled to 75 %, the area filled is below 75 %
// of the inner surface as well.
//
// The item's longer side goes along the pouch's length (instruments go in tip first).
//
// Pure module: no I/O.

export interface PouchSize {
  /** Flat width across the pouch, outside the seals, in mm. */
  widthMm: number;
  /** Flat length along the pouch, outside the seals, in mm. */
  lengthMm: number;
}

export interface PouchItem {
  lengthMm: number;
  widthMm: number;
  /** Height of the instrument lying flat; 0 for a flat instrument. */
  thicknessMm?: number;
}

export interface PouchRules {
  /** The seal width of the unit's sealer; EN 868-5 asks for at least 6 mm. */
  sealWidthMm: number;
  /** Clear space round the instrument on each side (about 2 cm, common practice). */
  clearanceMm: number;
  /** The largest share of the inner length the item may fill (ISO/TS 16775: 0.75). */
  maxLengthFill: number;
  /** Free space round an inner pouch inside the outer one's seals (common practice, from memory). */
  doubleClearanceMm: number;
}

/** EN 868-5: a seal at least 6 mm wide. */
export const MIN_SEAL_WIDTH_MM = 6;

export const DEFAULT_POUCH_RULES: PouchRules = {
  sealWidthMm: MIN_SEAL_WIDTH_MM,
  clearanceMm: 20,
  maxLengthFill: 0.75,
  doubleClearanceMm: 10,
};

/**
 * Common flat-pouch sizes, width × length in mm (common practice, from memory: sizes sold for
 * instrument reprocessing). A unit replaces the list with the pouches it actually stocks.
 */
export const DEFAULT_POUCH_SIZES: readonly PouchSize[] = [
  { widthMm: 57, lengthMm: 130 },
  { widthMm: 75, lengthMm: 250 },
  { widthMm: 90, lengthMm: 230 },
  { widthMm: 100, lengthMm: 300 },
  { widthMm: 135, lengthMm: 260 },
  { widthMm: 150, lengthMm: 300 },
  { widthMm: 190, lengthMm: 330 },
  { widthMm: 200, lengthMm: 400 },
  { widthMm: 250, lengthMm: 380 },
  { widthMm: 300, lengthMm: 450 },
];

/** How one pouch holds its content. */
export interface PouchFit {
  pouch: PouchSize;
  innerWidthMm: number;
  innerLengthMm: number;
  /** Share of the inner length the content takes, 0–1 (thickness included). */
  lengthFill: number;
  /** Free space on each side across the pouch, once the thickness is wrapped. */
  sideClearanceMm: number;
  /** Free space at each end along the pouch. */
  endClearanceMm: number;
}

export interface PouchAdvice {
  ok: boolean;
  double: boolean;
  /** The pouch the item goes in (the inner one when double). */
  pouch: PouchFit | null;
  /** The outer pouch, when double. */
  outer: PouchFit | null;
  /** The smallest flat pouch the item needs, width × length, whether or not one is in the list. */
  needs: PouchSize;
  /** The smallest outer pouch the recommended inner pouch needs (double only). */
  outerNeeds: PouchSize | null;
  /** The choice in words, one sentence a line. */
  explanation: string[];
}

/** A problem with the input, with what to fix; nothing is recommended from bad numbers. */
export class PouchInputError extends Error {
  readonly field: "lengthMm" | "widthMm" | "thicknessMm" | "sealWidthMm" | "pouches";
  constructor(field: PouchInputError["field"], message: string) {
    super(message);
    this.name = "PouchInputError";
    this.field = field;
  }
}

// Float noise (0.1 + 0.2) must not turn an exact boundary into a refusal.
const EPSILON = 1e-9;

/** "12", "12.5": whole millimetres where they are whole, else one decimal. */
export function mmText(value: number): string {
  const rounded = Math.round(value * 10) / 10;
  return Number.isInteger(rounded) ? String(rounded) : rounded.toFixed(1);
}

/** "100 × 300 mm" */
export function pouchText(pouch: PouchSize): string {
  return `${mmText(pouch.widthMm)} × ${mmText(pouch.lengthMm)} mm`;
}

const percent = (share: number) => `${Math.round(share * 1000) / 10} %`;

function checkPositive(field: "lengthMm" | "widthMm", value: number, what: string) {
  if (!Number.isFinite(value) || value <= 0) throw new PouchInputError(field, `Enter the ${what} in millimetres, more than 0.`);
  if (value > 2000) throw new PouchInputError(field, `The ${what} of ${mmText(value)} mm is more than 2 m: check the number.`);
}

function checkRules(rules: PouchRules) {
  if (!Number.isFinite(rules.sealWidthMm) || rules.sealWidthMm < MIN_SEAL_WIDTH_MM) {
    throw new PouchInputError(
      "sealWidthMm",
      `A seal must be at least ${MIN_SEAL_WIDTH_MM} mm wide (EN 868-5); ${mmText(rules.sealWidthMm)} mm is too narrow.`,
    );
  }
}

/** The inner size of a pouch: the flat size less one seal at each edge. */
export function innerSize(pouch: PouchSize, sealWidthMm: number): { widthMm: number; lengthMm: number } {
  return { widthMm: pouch.widthMm - 2 * sealWidthMm, lengthMm: pouch.lengthMm - 2 * sealWidthMm };
}

interface Content {
  /** Across the pouch, thickness wrapped in. */
  widthMm: number;
  /** Along the pouch, thickness wrapped in. */
  lengthMm: number;
}

function itemContent(item: PouchItem): Content {
  const thickness = item.thicknessMm ?? 0;
  const long = Math.max(item.lengthMm, item.widthMm);
  const short = Math.min(item.lengthMm, item.widthMm);
  return { widthMm: short + thickness, lengthMm: long + thickness };
}

/** Why the content does not fit the pouch (a sentence fragment), or the fit. */
function fitItem(pouch: PouchSize, content: Content, rules: PouchRules): { fit: PouchFit } | { reason: string } {
  const inner = innerSize(pouch, rules.sealWidthMm);
  const side = (inner.widthMm - content.widthMm) / 2;
  const end = (inner.lengthMm - content.lengthMm) / 2;
  const fill = inner.lengthMm > 0 ? content.lengthMm / inner.lengthMm : Infinity;
  if (side + EPSILON < rules.clearanceMm) {
    return {
      reason: `${pouchText(pouch)} is too narrow: ${mmText(inner.widthMm)} mm inside the seals leaves ${mmText(Math.max(0, side))} mm on each side, less than ${mmText(rules.clearanceMm)} mm`,
    };
  }
  if (fill > rules.maxLengthFill + EPSILON) {
    return {
      reason: `${pouchText(pouch)} is too short: the item would fill ${percent(fill)} of its ${mmText(inner.lengthMm)} mm inner length, more than ${percent(rules.maxLengthFill)}`,
    };
  }
  if (end + EPSILON < rules.clearanceMm) {
    return {
      reason: `${pouchText(pouch)} is too short: ${mmText(Math.max(0, end))} mm would be left at each end, less than ${mmText(rules.clearanceMm)} mm`,
    };
  }
  return {
    fit: { pouch, innerWidthMm: inner.widthMm, innerLengthMm: inner.lengthMm, lengthFill: fill, sideClearanceMm: side, endClearanceMm: end },
  };
}

/** How a sealed inner pouch sits in an outer one: flat, unfolded, clear of the outer seals. */
function fitPouchInPouch(outer: PouchSize, inner: PouchSize, rules: PouchRules): { fit: PouchFit } | { reason: string } {
  const size = innerSize(outer, rules.sealWidthMm);
  const side = (size.widthMm - inner.widthMm) / 2;
  const end = (size.lengthMm - inner.lengthMm) / 2;
  if (side + EPSILON < rules.doubleClearanceMm) {
    return {
      reason: `${pouchText(outer)} is too narrow for a ${pouchText(inner)} pouch: ${mmText(size.widthMm)} mm inside its seals leaves ${mmText(Math.max(0, side))} mm on each side, less than ${mmText(rules.doubleClearanceMm)} mm`,
    };
  }
  if (end + EPSILON < rules.doubleClearanceMm) {
    return {
      reason: `${pouchText(outer)} is too short for a ${pouchText(inner)} pouch: ${mmText(size.lengthMm)} mm inside its seals leaves ${mmText(Math.max(0, end))} mm at each end, less than ${mmText(rules.doubleClearanceMm)} mm`,
    };
  }
  return {
    fit: {
      pouch: outer,
      innerWidthMm: size.widthMm,
      innerLengthMm: size.lengthMm,
      lengthFill: inner.lengthMm / size.lengthMm,
      sideClearanceMm: side,
      endClearanceMm: end,
    },
  };
}

/** The smallest flat pouch the content needs under the rules. */
function neededFor(content: Content, rules: PouchRules): PouchSize {
  const innerLength = Math.max(content.lengthMm / rules.maxLengthFill, content.lengthMm + 2 * rules.clearanceMm);
  return {
    // Pouches come in whole millimetres: round up.
    widthMm: Math.ceil(content.widthMm + 2 * rules.clearanceMm + 2 * rules.sealWidthMm - EPSILON),
    lengthMm: Math.ceil(innerLength + 2 * rules.sealWidthMm - EPSILON),
  };
}

function outerNeededFor(inner: PouchSize, rules: PouchRules): PouchSize {
  return {
    widthMm: inner.widthMm + 2 * rules.doubleClearanceMm + 2 * rules.sealWidthMm,
    lengthMm: inner.lengthMm + 2 * rules.doubleClearanceMm + 2 * rules.sealWidthMm,
  };
}

const area = (p: PouchSize) => p.widthMm * p.lengthMm;
/** Smallest first: by area, then the shorter, then the narrower. */
const bySize = (a: PouchSize, b: PouchSize) => area(a) - area(b) || a.lengthMm - b.lengthMm || a.widthMm - b.widthMm;

function fitSentence(fit: PouchFit, rules: PouchRules, what: string): string {
  return (
    `${pouchText(fit.pouch)}: ${mmText(fit.innerWidthMm)} × ${mmText(fit.innerLengthMm)} mm inside its ${mmText(rules.sealWidthMm)} mm seals; ` +
    `${what} fills ${percent(fit.lengthFill)} of the inner length (at most ${percent(rules.maxLengthFill)}, ISO/TS 16775) ` +
    `and leaves ${mmText(fit.sideClearanceMm)} mm on each side and ${mmText(fit.endClearanceMm)} mm at each end ` +
    `(about ${mmText(rules.clearanceMm)} mm wanted, common practice).`
  );
}

function itemWords(item: PouchItem): string {
  const thickness = item.thicknessMm ?? 0;
  const long = Math.max(item.lengthMm, item.widthMm);
  const short = Math.min(item.lengthMm, item.widthMm);
  return `the ${mmText(long)} × ${mmText(short)} mm item${thickness > 0 ? `, ${mmText(thickness)} mm thick,` : ""}`;
}

/**
 * The smallest pouch in `pouches` for the item, or for double pouching the smallest pair (the
 * outer pouch first, then the inner one), with the reasons in words. Throws PouchInputError for
 * sizes that are not positive numbers or a seal narrower than EN 868-5 allows.
 */
export function recommendPouch(
  item: PouchItem,
  options: { pouches?: readonly PouchSize[]; double?: boolean; rules?: Partial<PouchRules> } = {},
): PouchAdvice {
  const rules: PouchRules = { ...DEFAULT_POUCH_RULES, ...options.rules };
  const pouches = [...(options.pouches ?? DEFAULT_POUCH_SIZES)].sort(bySize);
  const double = options.double ?? false;
  checkPositive("lengthMm", item.lengthMm, "length");
  checkPositive("widthMm", item.widthMm, "width");
  const thickness = item.thicknessMm ?? 0;
  if (!Number.isFinite(thickness) || thickness < 0) throw new PouchInputError("thicknessMm", "Enter the thickness in millimetres, 0 or more.");
  checkRules(rules);
  if (pouches.length === 0) throw new PouchInputError("pouches", "List at least one pouch size.");
  for (const p of pouches) {
    if (!(p.widthMm > 0 && p.lengthMm > 0)) throw new PouchInputError("pouches", `A pouch size of ${pouchText(p)} is not a size: check the list.`);
  }

  const content = itemContent(item);
  const needs = neededFor(content, rules);
  const words = itemWords(item);
  const needsWords = `needs a pouch of at least ${pouchText(needs)} (flat size, with ${mmText(rules.sealWidthMm)} mm seals)`;

  const attempts = pouches.map((pouch) => ({ pouch, result: fitItem(pouch, content, rules) }));
  const fitting = attempts.flatMap((a) => ("fit" in a.result ? [a.result.fit] : []));
  // The reasons the nearest smaller pouches were passed over (at most two, largest first).
  const passedOver = (below: PouchSize) =>
    attempts
      .filter((a) => "reason" in a.result && bySize(a.pouch, below) < 0)
      .slice(-2)
      .reverse()
      .map((a) => `${(a.result as { reason: string }).reason}.`);

  if (!double) {
    const best = fitting[0];
    if (!best) {
      return {
        ok: false,
        double,
        pouch: null,
        outer: null,
        needs,
        outerNeeds: null,
        explanation: [
          `No pouch in the list fits: ${words} ${needsWords}.`,
          `Use a larger pouch (from a roll), a wrap or a container.`,
        ],
      };
    }
    return {
      ok: true,
      double,
      pouch: best,
      outer: null,
      needs,
      outerNeeds: null,
      explanation: [`Use ${pouchText(best.pouch)}.`, fitSentence(best, rules, words), ...passedOver(best.pouch)],
    };
  }

  // Double: every inner pouch that holds the item, paired with every outer pouch that holds it.
  const pairs = fitting.flatMap((innerFit) =>
    pouches.flatMap((outer) => {
      const result = fitPouchInPouch(outer, innerFit.pouch, rules);
      return "fit" in result ? [{ inner: innerFit, outer: result.fit }] : [];
    }),
  );
  pairs.sort((a, b) => bySize(a.outer.pouch, b.outer.pouch) || bySize(a.inner.pouch, b.inner.pouch));
  const pair = pairs[0];
  if (!pair) {
    const smallestInner = fitting[0];
    const explanation = smallestInner
      ? [
          `No pair of pouches in the list fits: the item fits in ${pouchText(smallestInner.pouch)}, but no listed pouch holds that one flat with ${mmText(rules.doubleClearanceMm)} mm clear of its seals.`,
          `The outer pouch must be at least ${pouchText(outerNeededFor(smallestInner.pouch, rules))}. Use a larger outer pouch (from a roll), a wrap or a container.`,
        ]
      : [
          `No pouch in the list fits even the inner layer: ${words} ${needsWords}.`,
          `Use larger pouches (from a roll), a wrap or a container.`,
        ];
    return {
      ok: false,
      double,
      pouch: smallestInner ?? null,
      outer: null,
      needs,
      outerNeeds: smallestInner ? outerNeededFor(smallestInner.pouch, rules) : null,
      explanation,
    };
  }
  return {
    ok: true,
    double,
    pouch: pair.inner,
    outer: pair.outer,
    needs,
    outerNeeds: outerNeededFor(pair.inner.pouch, rules),
    explanation: [
      `Use ${pouchText(pair.inner.pouch)} inside ${pouchText(pair.outer.pouch)}.`,
      `Inner pouch ${fitSentence(pair.inner, rules, words)}`,
      `Outer pouch ${pouchText(pair.outer.pouch)}: ${mmText(pair.outer.innerWidthMm)} × ${mmText(pair.outer.innerLengthMm)} mm inside its seals holds the inner pouch flat, unfolded, with ${mmText(pair.outer.sideClearanceMm)} mm on each side and ${mmText(pair.outer.endClearanceMm)} mm at each end clear of the seals (at least ${mmText(rules.doubleClearanceMm)} mm).`,
    ],
  };
}
