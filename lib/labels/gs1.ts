// GS1 element strings: check digits, the Application Identifiers (AIs) Steamlane reads and
// prints, encoding, parsing of what a scanner types, and the GIAI that identifies a set.
//
// Sources: the GS1 General Specifications (section numbers below are quoted from memory) and the
// GS1 Barcode Syntax Dictionary, GS1's machine-readable table of AI formats, FNC1 rules and
// mandatory or invalid AI pairings, which the AI table below follows entry by entry.
//
// Pure module: no I/O. Dates need "the current year" for the century rule; pass `now` to make a
// call deterministic.

/** The GS (group separator, ASCII 29) that a scanner transmits for an FNC1 separator. */
export const GS = "\u001d";

/**
 * Text that some scanners and keyboard wedges send instead of GS when they cannot type ASCII 29:
 * the literal "<GS>" (common in configuration tools and printed examples), "{GS}", and the
 * visible symbol U+241D "␝". They count as separators only when the input holds no real GS.
 */
export const GS_SUBSTITUTES: readonly string[] = ["<GS>", "{GS}", "\u241d"];

/**
 * The GS1 demonstration company prefix used for Steamlane's demo set identifiers. GS1 reserves
 * the GS1 Prefix 952 for demonstrations and examples (GS1 General Specifications, GS1 Prefix
 * table).
 */
export const DEMO_COMPANY_PREFIX = "9521234";

export type Gs1ErrorCode =
  | "empty"
  | "syntax"
  | "not-gs1"
  | "unknown-ai"
  | "length"
  | "charset"
  | "check-digit"
  | "date"
  | "company-prefix"
  | "duplicate-ai"
  | "association"
  | "render";

/** A GS1 input or output problem; `message` says which AI is affected and what to fix. */
export class Gs1Error extends Error {
  readonly code: Gs1ErrorCode;
  readonly ai?: string;
  /** 0-based offset into the parsed input (messages count characters from 1). */
  readonly position?: number;

  constructor(code: Gs1ErrorCode, message: string, details: { ai?: string; position?: number } = {}) {
    super(message);
    this.name = "Gs1Error";
    this.code = code;
    this.ai = details.ai;
    this.position = details.position;
  }
}

// ---------------------------------------------------------------------------------------------
// Check digits

// GS1 mod-10 check digit: weights 3 and 1 alternating from the rightmost digit (GS1 General
// Specifications, 7.9 "Check digit calculation", from memory). Works for GTIN-8/12/13/14, GLN,
// SSCC and GSRN bodies.
export function gs1CheckDigit(digitsWithoutCheck: string): number {
  if (!/^\d+$/.test(digitsWithoutCheck)) {
    throw new Gs1Error("charset", `A check digit needs digits only, got "${digitsWithoutCheck}"`);
  }
  let sum = 0;
  for (let i = 0; i < digitsWithoutCheck.length; i++) {
    const digit = digitsWithoutCheck.charCodeAt(digitsWithoutCheck.length - 1 - i) - 48;
    sum += digit * (i % 2 === 0 ? 3 : 1);
  }
  return (10 - (sum % 10)) % 10;
}

// True when `full` is all digits and its last digit is the GS1 check digit of the rest.
export function isValidGs1CheckDigit(full: string): boolean {
  if (!/^\d{2,}$/.test(full)) return false;
  return gs1CheckDigit(full.slice(0, -1)) === Number(full[full.length - 1]);
}

// ---------------------------------------------------------------------------------------------
// The Application Identifier table

export type Gs1Charset = "numeric" | "cset82";

/** `yymmd0`: YYMMDD where day 00 means "month only"; `yymmddhhmm`: date then time, no day 00. */
export type Gs1DateFormat = "yymmd0" | "yymmddhhmm";

export interface AiDefinition {
  ai: string;
  title: string;
  /** The exact length when `fixedLength`, otherwise the maximum (the minimum is 1). */
  length: number;
  fixedLength: boolean;
  charset: Gs1Charset;
  checkDigit: boolean;
  /** The data starts with a GS1 Company Prefix, so its first four characters are digits. */
  companyPrefix: boolean;
  date?: Gs1DateFormat;
  /**
   * Predefined length (the first two AI digits are in GS1's predefined-length table): no FNC1
   * separator follows it even when another element comes next. Every other AI, fixed-length
   * ones such as (7003) included, ends with FNC1 (transmitted as GS) unless it is last.
   */
  predefinedLength: boolean;
  /** Mandatory associations: from each inner list at least one AI must be present too. */
  requires: readonly (readonly string[])[];
  /** AIs this one may not appear with. */
  excludes: readonly string[];
}

interface DefineOptions {
  predefinedLength?: boolean;
  checkDigit?: boolean;
  companyPrefix?: boolean;
  date?: Gs1DateFormat;
  requires?: string[][];
  excludes?: string[];
}

// `format` in GS1 notation: "N14" fixed numeric, "N..8" numeric up to 8, "X..20" character set
// 82 up to 20.
function define(ai: string, title: string, format: string, options: DefineOptions = {}): AiDefinition {
  const match = /^([NX])(\.\.)?(\d+)$/.exec(format);
  if (!match) throw new Error(`Bad AI format "${format}" for (${ai})`);
  return {
    ai,
    title,
    length: Number(match[3]),
    fixedLength: match[2] === undefined,
    charset: match[1] === "N" ? "numeric" : "cset82",
    checkDigit: options.checkDigit ?? false,
    companyPrefix: options.companyPrefix ?? false,
    date: options.date,
    predefinedLength: options.predefinedLength ?? false,
    requires: options.requires ?? [],
    excludes: options.excludes ?? [],
  };
}

// The identifiers a trade-item attribute such as a lot or a date must travel with.
const TRADE_ITEM_KEYS = ["01", "02", "8006", "8026"];

// Formats, FNC1 flags, pairings: GS1 Barcode Syntax Dictionary; definitions: GS1 General
// Specifications section 3 (AI definitions). Only AIs whose format was checked there are listed;
// anything else is rejected as unsupported rather than guessed.
const AI_TABLE: readonly AiDefinition[] = [
  define("00", "SSCC (logistic unit)", "N18", { predefinedLength: true, checkDigit: true, companyPrefix: true }),
  define("01", "GTIN (trade item)", "N14", {
    predefinedLength: true,
    checkDigit: true,
    companyPrefix: true,
    excludes: ["02", "255", "37"],
  }),
  define("02", "GTIN of contained trade items", "N14", {
    predefinedLength: true,
    checkDigit: true,
    companyPrefix: true,
    requires: [["37"]],
  }),
  define("10", "batch or lot number", "X..20", { requires: [TRADE_ITEM_KEYS] }),
  define("11", "production date", "N6", { predefinedLength: true, date: "yymmd0", requires: [TRADE_ITEM_KEYS] }),
  define("13", "packaging date", "N6", { predefinedLength: true, date: "yymmd0", requires: [TRADE_ITEM_KEYS] }),
  define("15", "best before date", "N6", { predefinedLength: true, date: "yymmd0", requires: [TRADE_ITEM_KEYS] }),
  define("16", "sell by date", "N6", { predefinedLength: true, date: "yymmd0", requires: [TRADE_ITEM_KEYS] }),
  define("17", "expiry date", "N6", {
    predefinedLength: true,
    date: "yymmd0",
    requires: [["01", "02", "255", "8006", "8026"]],
  }),
  define("20", "internal product variant", "N2", { predefinedLength: true, requires: [TRADE_ITEM_KEYS] }),
  define("21", "serial number", "X..20", { requires: [["01", "8006"]], excludes: ["235"] }),
  define("240", "additional product identification", "X..30", { requires: [TRADE_ITEM_KEYS] }),
  define("241", "customer part number", "X..30", { requires: [TRADE_ITEM_KEYS] }),
  define("250", "secondary serial number", "X..30", { requires: [["01", "8006"], ["21"]] }),
  define("30", "variable count of items", "N..8", { requires: [["01", "02"]] }),
  define("37", "count of trade items in a logistic unit", "N..8", { requires: [["00"], ["02", "8026"]] }),
  define("400", "customer's purchase order number", "X..30"),
  define("414", "GLN of a physical location", "N13", { predefinedLength: true, checkDigit: true, companyPrefix: true }),
  define("7003", "expiry date and time", "N10", { date: "yymmddhhmm", requires: [["01", "02"]] }),
  define("8004", "GIAI (individual asset)", "X..30", { companyPrefix: true }),
];

const AI_BY_CODE = new Map(AI_TABLE.map((definition) => [definition.ai, definition]));

/** Every AI this module encodes and parses. */
export const GS1_AIS: readonly AiDefinition[] = AI_TABLE;

export function getAiDefinition(ai: string): AiDefinition | undefined {
  return AI_BY_CODE.get(ai);
}

const SUPPORTED_LIST = AI_TABLE.map((definition) => `(${definition.ai})`).join(", ");

// ---------------------------------------------------------------------------------------------
// Values

/** One element to encode: an AI and its data as printed (digits of dates as YYMMDD…). */
export interface Gs1ElementInput {
  ai: string;
  value: string;
}

/** One parsed element. */
export interface Gs1Element {
  ai: string;
  value: string;
  /** For date AIs: the date as ISO "YYYY-MM-DD"; a day 00 is resolved to the month's last day. */
  date?: string;
  /** Set when the data carried day 00 (year and month only). */
  dayOmitted?: boolean;
  /** For (7003): ISO "YYYY-MM-DDTHH:MM" as printed; GS1 gives no time zone for it. */
  dateTime?: string;
}

interface ValueProblem {
  code: Gs1ErrorCode;
  /** 0-based offset of the offending character inside the value. */
  offset: number;
  message: string;
}

// GS1 AI encodable character set 82 (GS1 General Specifications figure 7.11-1; also the
// cset82 test of the GS1 Barcode Syntax Dictionary): ! " % & ' ( ) * + , - . / 0-9 : ; < = > ?
// A-Z _ a-z. No space, no # $ @ [ \ ] ^ ` { | } ~.
const CSET82 = /^[!"%&'()*+,\-./0-9:;<=>?A-Z_a-z]$/;
const CSET82_HINT = `letters, digits and ! " % & ' ( ) * + , - . / : ; < = > ? _`;

function describeChar(char: string): string {
  const code = char.codePointAt(0) ?? 0;
  if (code < 32 || code === 127) return `control character 0x${code.toString(16).padStart(2, "0")}`;
  if (char === " ") return "a space";
  return `"${char}"`;
}

function checkCharset(definition: AiDefinition, value: string): ValueProblem | null {
  for (let i = 0; i < value.length; i++) {
    const char = value[i];
    if (definition.charset === "numeric" && (char < "0" || char > "9")) {
      return { code: "charset", offset: i, message: `digits only, but data character ${i + 1} is ${describeChar(char)}` };
    }
    if (definition.charset === "cset82" && !CSET82.test(char)) {
      return {
        code: "charset",
        offset: i,
        message: `data character ${i + 1} is ${describeChar(char)}, which is not in GS1 character set 82 (${CSET82_HINT})`,
      };
    }
  }
  return null;
}

// Century of a two-digit year (GS1 General Specifications 7.12 "Determination of century in
// dates", from memory): with D = YY minus the current year's last two digits, D from 51 to 99
// means the previous century, D from -99 to -50 the next one, anything else the current century.
// The GS1 Barcode Syntax Dictionary's yymmd0 test applies the same window.
export function gs1Year(yy: number, now: Date = new Date()): number {
  const currentYear = now.getUTCFullYear();
  const currentYy = currentYear % 100;
  const century = currentYear - currentYy;
  const difference = yy - currentYy;
  if (difference >= 51) return century - 100 + yy;
  if (difference <= -50) return century + 100 + yy;
  return century + yy;
}

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

const pad2 = (n: number) => String(n).padStart(2, "0");

interface ResolvedDate {
  date: string;
  dayOmitted: boolean;
  dateTime?: string;
}

function resolveDate(format: Gs1DateFormat, value: string, now: Date): ResolvedDate | ValueProblem {
  const yy = Number(value.slice(0, 2));
  const month = Number(value.slice(2, 4));
  const day = Number(value.slice(4, 6));
  const year = gs1Year(yy, now);
  if (month < 1 || month > 12) {
    return { code: "date", offset: 2, message: `month ${value.slice(2, 4)} is not valid (the date is YYMMDD)` };
  }
  const lastDay = daysInMonth(year, month);
  if (day === 0 && format === "yymmddhhmm") {
    return { code: "date", offset: 4, message: "day 00 is not allowed in a date with a time" };
  }
  if (day > lastDay) {
    return { code: "date", offset: 4, message: `day ${value.slice(4, 6)} is not valid in ${year}-${pad2(month)}` };
  }
  // Day 00: only year and month are given; the date is read as the last day of that month
  // (GS1 General Specifications, definitions of AIs (11) to (17), from memory).
  const date = `${year}-${pad2(month)}-${pad2(day === 0 ? lastDay : day)}`;
  if (format === "yymmd0") return { date, dayOmitted: day === 0 };

  const hour = Number(value.slice(6, 8));
  const minute = Number(value.slice(8, 10));
  if (hour > 23) return { code: "date", offset: 6, message: `hour ${value.slice(6, 8)} is not valid (00 to 23)` };
  if (minute > 59) return { code: "date", offset: 8, message: `minute ${value.slice(8, 10)} is not valid (00 to 59)` };
  return { date, dayOmitted: false, dateTime: `${date}T${value.slice(6, 8)}:${value.slice(8, 10)}` };
}

const isProblem = (result: ResolvedDate | ValueProblem): result is ValueProblem => "code" in result;

// Checks one value against its AI; returns the parsed element or the first problem found.
function checkValue(definition: AiDefinition, value: string, now: Date): Gs1Element | ValueProblem {
  if (value.length === 0) return { code: "length", offset: 0, message: "has no data" };
  if (definition.fixedLength && value.length !== definition.length) {
    return {
      code: "length",
      offset: Math.min(value.length, definition.length),
      message: `needs exactly ${definition.length} characters, got ${value.length}`,
    };
  }
  if (!definition.fixedLength && value.length > definition.length) {
    return {
      code: "length",
      offset: definition.length,
      message: `allows at most ${definition.length} characters, got ${value.length}`,
    };
  }
  const charsetProblem = checkCharset(definition, value);
  if (charsetProblem) return charsetProblem;
  if (definition.companyPrefix && !/^\d{4}/.test(value)) {
    return {
      code: "company-prefix",
      offset: 0,
      message: "must start with a GS1 Company Prefix (at least 4 digits)",
    };
  }
  if (definition.checkDigit && !isValidGs1CheckDigit(value)) {
    const expected = gs1CheckDigit(value.slice(0, -1));
    return {
      code: "check-digit",
      offset: value.length - 1,
      message: `check digit is ${value[value.length - 1]}, but ${value.slice(0, -1)} needs ${expected}`,
    };
  }
  const element: Gs1Element = { ai: definition.ai, value };
  if (definition.date) {
    const resolved = resolveDate(definition.date, value, now);
    if (isProblem(resolved)) return resolved;
    element.date = resolved.date;
    if (resolved.dayOmitted) element.dayOmitted = true;
    if (resolved.dateTime) element.dateTime = resolved.dateTime;
  }
  return element;
}

const isValueProblem = (result: Gs1Element | ValueProblem): result is ValueProblem => "code" in result;

// Problems with mandatory AI associations and invalid pairs (GS1 General Specifications 4.14,
// from memory; the lists come from the GS1 Barcode Syntax Dictionary). GS1 evaluates these over
// all barcodes on an item, so parsing one symbol does not enforce them; encoding one does.
export function aiAssociationProblems(elements: ReadonlyArray<{ ai: string }>): string[] {
  const present = new Set(elements.map((element) => element.ai));
  const problems: string[] = [];
  const reportedPairs = new Set<string>();
  for (const ai of present) {
    const definition = AI_BY_CODE.get(ai);
    if (!definition) continue;
    for (const group of definition.requires) {
      if (!group.some((required) => present.has(required))) {
        const names = group.map((required) => `(${required})`);
        problems.push(
          names.length === 1
            ? `AI (${ai}) must appear together with AI ${names[0]}`
            : `AI (${ai}) must appear together with one of ${names.join(", ")}`,
        );
      }
    }
    for (const excluded of definition.excludes) {
      const pair = [ai, excluded].sort().join("+");
      if (present.has(excluded) && !reportedPairs.has(pair)) {
        reportedPairs.add(pair);
        problems.push(`AI (${ai}) cannot appear together with AI (${excluded})`);
      }
    }
  }
  return problems;
}

// ---------------------------------------------------------------------------------------------
// Encoding

export interface EncodeOptions {
  /** Reference date for the century of two-digit years (default: now). */
  now?: Date;
  /** Check mandatory associations and invalid pairs (default true). */
  checkAssociations?: boolean;
}

function requireDefinition(ai: string): AiDefinition {
  if (!/^\d{2,4}$/.test(ai)) {
    throw new Gs1Error("unknown-ai", `"${ai}" is not an Application Identifier (2 to 4 digits)`, { ai });
  }
  const definition = AI_BY_CODE.get(ai);
  if (!definition) {
    throw new Gs1Error("unknown-ai", `AI (${ai}) is unknown or not supported; supported: ${SUPPORTED_LIST}`, { ai });
  }
  return definition;
}

// Validates every element and returns the element string a scanner transmits: no symbology
// identifier, no leading FNC1, and a GS after each element that is not of predefined length
// and not last. Elements stay in the order given.
export function encodeElementString(elements: readonly Gs1ElementInput[], options: EncodeOptions = {}): string {
  if (elements.length === 0) throw new Gs1Error("empty", "Nothing to encode: give at least one element");
  const now = options.now ?? new Date();
  const seen = new Set<string>();
  let out = "";
  elements.forEach((element, index) => {
    const definition = requireDefinition(element.ai);
    if (seen.has(element.ai)) {
      throw new Gs1Error("duplicate-ai", `AI (${element.ai}) is given more than once`, { ai: element.ai });
    }
    seen.add(element.ai);
    const checked = checkValue(definition, element.value, now);
    if (isValueProblem(checked)) {
      throw new Gs1Error(checked.code, `AI (${element.ai}) ${checked.message}`, { ai: element.ai });
    }
    out += element.ai + element.value;
    if (!definition.predefinedLength && index < elements.length - 1) out += GS;
  });
  if (options.checkAssociations ?? true) {
    const problems = aiAssociationProblems(elements);
    if (problems.length > 0) throw new Gs1Error("association", problems.join("; "));
  }
  return out;
}

// The human-readable form printed under a symbol: "(01)09521234543213(17)250101(10)ABC123".
export function formatHumanReadable(elements: readonly Gs1ElementInput[]): string {
  return elements.map((element) => `(${element.ai})${element.value}`).join("");
}

// ---------------------------------------------------------------------------------------------
// Parsing

export interface ParseOptions {
  /** Reference date for the century of two-digit years (default: now). */
  now?: Date;
  /** Separator substitutes accepted when the input holds no real GS (default GS_SUBSTITUTES). */
  separatorSubstitutes?: readonly string[];
}

/**
 * Symbology identifiers (ISO/IEC 15424, as listed in the GS1 General Specifications 5.1.2, from
 * memory) that announce GS1 element strings. Other identifiers (]d1, ]C0, ]Q1…) carry plain data.
 */
const GS1_SYMBOLOGY_IDENTIFIERS: Readonly<Record<string, string>> = {
  "]C1": "GS1-128",
  "]d2": "GS1 DataMatrix",
  "]Q3": "GS1 QR Code",
  "]e0": "GS1 DataBar",
};

const SYMBOLOGY_IDENTIFIER = /^\][A-Za-z][0-9A-Za-z]/;

interface Cursor {
  raw: string;
  end: number;
  separators: readonly string[];
  now: Date;
}

function trimmedBounds(raw: string): { start: number; end: number } {
  let start = 0;
  let end = raw.length;
  while (start < end && /\s/.test(raw[start])) start++;
  while (end > start && /\s/.test(raw[end - 1])) end--;
  return { start, end };
}

function separatorsFor(raw: string, options: ParseOptions): readonly string[] {
  if (raw.includes(GS)) return [GS];
  return [GS, ...(options.separatorSubstitutes ?? GS_SUBSTITUTES)];
}

function separatorAt(cursor: Cursor, position: number): number {
  for (const separator of cursor.separators) {
    if (position + separator.length <= cursor.end && cursor.raw.startsWith(separator, position)) {
      return separator.length;
    }
  }
  return 0;
}

const at = (position: number) => `character ${position + 1}`;

function addElement(elements: Gs1Element[], element: Gs1Element, position: number): void {
  const earlier = elements.find((existing) => existing.ai === element.ai);
  if (!earlier) {
    elements.push(element);
    return;
  }
  // A repeat with the same data is harmless; with different data the scan contradicts itself.
  if (earlier.value !== element.value) {
    throw new Gs1Error(
      "duplicate-ai",
      `AI (${element.ai}) at ${at(position)} appears twice with different data ("${earlier.value}" and "${element.value}")`,
      { ai: element.ai, position },
    );
  }
}

function checkParsedValue(cursor: Cursor, definition: AiDefinition, value: string, valueStart: number): Gs1Element {
  const checked = checkValue(definition, value, cursor.now);
  if (!isValueProblem(checked)) return checked;
  const position = valueStart + checked.offset;
  throw new Gs1Error(checked.code, `AI (${definition.ai}) at ${at(position)}: ${checked.message}`, {
    ai: definition.ai,
    position,
  });
}

function readAi(cursor: Cursor, position: number): AiDefinition {
  const { raw, end } = cursor;
  for (const length of [2, 3, 4]) {
    if (position + length > end) break;
    const definition = AI_BY_CODE.get(raw.slice(position, position + length));
    if (definition) return definition;
  }
  const digits = /^\d{1,4}/.exec(raw.slice(position, end))?.[0];
  if (!digits) {
    throw new Gs1Error("syntax", `Expected an Application Identifier (digits) at ${at(position)}, found ${describeChar(raw[position])}`, {
      position,
    });
  }
  throw new Gs1Error(
    "unknown-ai",
    `Unknown or unsupported Application Identifier starting "${digits}" at ${at(position)}; supported: ${SUPPORTED_LIST}`,
    { position },
  );
}

// Element strings as transmitted: AI, data, and GS (or a substitute) after FNC1-terminated data.
function parseTransmitted(cursor: Cursor, start: number): Gs1Element[] {
  const elements: Gs1Element[] = [];
  let position = start;
  const skipSeparators = () => {
    let length: number;
    while (position < cursor.end && (length = separatorAt(cursor, position)) > 0) position += length;
  };
  // Some scanners transmit the leading FNC1 as a GS.
  skipSeparators();
  while (position < cursor.end) {
    const aiPosition = position;
    const definition = readAi(cursor, position);
    position += definition.ai.length;
    const valueStart = position;
    if (definition.fixedLength) {
      // A fixed-length field ends after its length whether or not a separator follows.
      while (position < cursor.end && position - valueStart < definition.length && separatorAt(cursor, position) === 0) {
        position++;
      }
      const found = position - valueStart;
      if (found < definition.length) {
        const stop = position >= cursor.end ? "the end of the scan" : "a separator";
        throw new Gs1Error(
          "length",
          `AI (${definition.ai}) at ${at(aiPosition)} is cut short: it needs ${definition.length} characters, found ${found} before ${stop}`,
          { ai: definition.ai, position },
        );
      }
    } else {
      while (position < cursor.end && separatorAt(cursor, position) === 0) position++;
    }
    const value = cursor.raw.slice(valueStart, position);
    addElement(elements, checkParsedValue(cursor, definition, value, valueStart), aiPosition);
    skipSeparators();
  }
  if (elements.length === 0) {
    throw new Gs1Error("empty", "The scan holds no element after its prefix and separators", { position: start });
  }
  return elements;
}

const BRACKETED_AI = /\((\d{2,4})\)/g;

// The human-readable form "(01)…(10)…". A value runs to the next "(" + 2–4 digits + ")", so data
// that itself contains such a group cannot be told apart and is split there.
function parseBracketed(cursor: Cursor, start: number): Gs1Element[] {
  const { raw, end } = cursor;
  const text = raw.slice(0, end);
  const groups: Array<{ ai: string; at: number; valueStart: number }> = [];
  BRACKETED_AI.lastIndex = start;
  for (let match = BRACKETED_AI.exec(text); match; match = BRACKETED_AI.exec(text)) {
    groups.push({ ai: match[1], at: match.index, valueStart: match.index + match[0].length });
  }
  if (groups.length === 0 || groups[0].at !== start) {
    throw new Gs1Error("syntax", `Expected "(" and an Application Identifier of 2 to 4 digits at ${at(start)}`, {
      position: start,
    });
  }
  const elements: Gs1Element[] = [];
  groups.forEach((group, index) => {
    const definition = AI_BY_CODE.get(group.ai);
    if (!definition) {
      throw new Gs1Error("unknown-ai", `Unknown or unsupported AI (${group.ai}) at ${at(group.at)}; supported: ${SUPPORTED_LIST}`, {
        ai: group.ai,
        position: group.at,
      });
    }
    // Whitespace is never data (it is outside character set 82), so spaces between groups go.
    let valueStart = group.valueStart;
    let valueEnd = index + 1 < groups.length ? groups[index + 1].at : end;
    while (valueStart < valueEnd && /\s/.test(raw[valueStart])) valueStart++;
    while (valueEnd > valueStart && /\s/.test(raw[valueEnd - 1])) valueEnd--;
    const value = raw.slice(valueStart, valueEnd);
    addElement(elements, checkParsedValue(cursor, definition, value, valueStart), group.at);
  });
  return elements;
}

// Parses what a scanner (or a person) enters: an optional GS1 symbology identifier (]C1, ]d2,
// ]Q3, ]e0), then either the transmitted element string, with GS (0x1D) or, when the input
// holds no GS, "<GS>", "{GS}" or "␝" as separators, or the bracketed human-readable form.
// Surrounding whitespace (a scanner's Enter suffix) is ignored. Throws Gs1Error with a position.
export function parseElementString(raw: string, options: ParseOptions = {}): Gs1Element[] {
  const { start, end } = trimmedBounds(raw);
  if (start === end) throw new Gs1Error("empty", "The scan is empty");
  const cursor: Cursor = { raw, end, separators: separatorsFor(raw, options), now: options.now ?? new Date() };
  let position = start;
  const identifier = SYMBOLOGY_IDENTIFIER.exec(raw.slice(start, end))?.[0];
  if (identifier) {
    if (!GS1_SYMBOLOGY_IDENTIFIERS[identifier]) {
      throw new Gs1Error(
        "not-gs1",
        `Symbology identifier ${identifier} does not announce GS1 data (expected ${Object.keys(GS1_SYMBOLOGY_IDENTIFIERS).join(", ")})`,
        { position: start },
      );
    }
    position += identifier.length;
    if (position === end) throw new Gs1Error("empty", `Nothing follows the symbology identifier ${identifier}`, { position });
  }
  return raw[position] === "(" ? parseBracketed(cursor, position) : parseTransmitted(cursor, position);
}

// ---------------------------------------------------------------------------------------------
// Steamlane set identifiers and scans

// The GIAI of a set: GS1 Company Prefix (4 to 12 digits) followed by the unit's own asset
// reference, in character set 82, 30 characters at most (GS1 General Specifications, GIAI,
// from memory; the 4-digit minimum follows the Syntax Dictionary's company prefix test).
export function makeSetGiai(companyPrefix: string, serial: string): string {
  if (!/^\d{4,12}$/.test(companyPrefix)) {
    throw new Gs1Error("company-prefix", `A GS1 Company Prefix is 4 to 12 digits, got "${companyPrefix}"`, { ai: "8004" });
  }
  if (serial.length === 0) throw new Gs1Error("length", "The set's asset reference is empty", { ai: "8004" });
  const giai = companyPrefix + serial;
  const giaiDefinition = AI_BY_CODE.get("8004")!;
  if (giai.length > giaiDefinition.length) {
    throw new Gs1Error(
      "length",
      `GIAI ${giai} is ${giai.length} characters; with company prefix ${companyPrefix} the asset reference may have at most ${giaiDefinition.length - companyPrefix.length}`,
      { ai: "8004" },
    );
  }
  const problem = checkCharset(giaiDefinition, serial);
  if (problem) throw new Gs1Error(problem.code, `GIAI asset reference "${serial}": ${problem.message}`, { ai: "8004" });
  return giai;
}

/** What a station scanned; `typed` is plain text that is not GS1 data, used as a typed code. */
export type ScanResult =
  | { kind: "set"; giai: string; elements: Gs1Element[] }
  | { kind: "gtin"; gtin: string; lot?: string; serial?: string; expiry?: string; elements: Gs1Element[] }
  | { kind: "sscc"; sscc: string; elements: Gs1Element[] }
  | { kind: "gs1"; elements: Gs1Element[] }
  | { kind: "typed"; code: string };

function classify(elements: Gs1Element[]): ScanResult {
  const value = (ai: string) => elements.find((element) => element.ai === ai);
  const giai = value("8004");
  if (giai) return { kind: "set", giai: giai.value, elements };
  const gtin = value("01");
  if (gtin) {
    const result: Extract<ScanResult, { kind: "gtin" }> = { kind: "gtin", gtin: gtin.value, elements };
    const lot = value("10")?.value;
    const serial = value("21")?.value;
    const expiry = value("17")?.date;
    if (lot !== undefined) result.lot = lot;
    if (serial !== undefined) result.serial = serial;
    if (expiry !== undefined) result.expiry = expiry;
    return result;
  }
  const sscc = value("00");
  if (sscc) return { kind: "sscc", sscc: sscc.value, elements };
  return { kind: "gs1", elements };
}

// Plain text read as GS1 data even without a symbology identifier or separator: it starts with
// a GIAI, a GTIN or an SSCC element (as a scanner sends a single-element symbol).
const BARE_ELEMENT_STRING = /^(8004\d{4}|01\d{14}|00\d{18})/;
const BRACKETED_START = /^\(\d{2,4}\)/;

// Tells a station what was scanned: a set's GIAI, a product GTIN (with lot, serial, expiry), an
// SSCC, other GS1 data, or a typed code. Input is GS1 data when it carries a GS1 symbology
// identifier, a separator, the bracketed form, or starts with (8004), (01) or (00) data; then a
// malformed string throws Gs1Error. EAN/UPC scans (]E0, ]E4) become GTIN-14. Anything else is a
// typed code: the trimmed text, minus any non-GS1 symbology identifier.
export function parseScan(raw: string, options: ParseOptions = {}): ScanResult {
  const text = raw.trim();
  if (text.length === 0) throw new Gs1Error("empty", "The scan is empty");
  const identifier = SYMBOLOGY_IDENTIFIER.exec(text)?.[0];
  if (identifier && GS1_SYMBOLOGY_IDENTIFIERS[identifier]) return classify(parseElementString(raw, options));
  if (identifier === "]E0" || identifier === "]E4") return parseEanUpc(identifier, text.slice(3));
  if (identifier) {
    const code = text.slice(identifier.length).trim();
    if (code.length === 0) throw new Gs1Error("empty", `Nothing follows the symbology identifier ${identifier}`);
    return { kind: "typed", code };
  }
  const separators = separatorsFor(text, options);
  const looksGs1 =
    BRACKETED_START.test(text) || BARE_ELEMENT_STRING.test(text) || separators.some((separator) => text.includes(separator));
  if (looksGs1) return classify(parseElementString(raw, options));
  return { kind: "typed", code: text };
}

// EAN-13 / UPC-A (]E0, 13 digits) and EAN-8 (]E4, 8 digits) carry a bare GTIN; GS1 stores GTINs
// as 14 digits with leading zeros.
function parseEanUpc(identifier: string, digits: string): ScanResult {
  const expected = identifier === "]E0" ? 13 : 8;
  if (!new RegExp(`^\\d{${expected}}$`).test(digits)) {
    throw new Gs1Error("length", `An ${identifier} scan carries ${expected} digits, got "${digits}"`, { ai: "01" });
  }
  if (!isValidGs1CheckDigit(digits)) {
    throw new Gs1Error("check-digit", `GTIN ${digits} has a wrong check digit (expected ${gs1CheckDigit(digits.slice(0, -1))})`, {
      ai: "01",
    });
  }
  const gtin = digits.padStart(14, "0");
  return { kind: "gtin", gtin, elements: [{ ai: "01", value: gtin }] };
}
