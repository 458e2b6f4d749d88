import Papa from "papaparse";
import type { SetTypeItemValues, SetTypeValues } from "./compare";
import { decimalProblem, hundredthsOfKgToGrams, MAX_SIZE_STU, MAX_WEIGHT_KG, readDecimal } from "./measures";
import { CODE_MAX, CODE_PATTERN, ITEM_COUNT_MAX, ITEM_NAME_MAX, ITEMS_MAX, NAME_MAX, NOTES_MAX } from "./schemas";
import {
  isPackaging,
  isProcessingFlag,
  isSetClass,
  isSterilisationMethod,
  PACKAGINGS,
  type ProcessingFlag,
  PROCESSING_FLAGS,
  SET_CLASSES,
  STERILISATION_METHODS,
} from "./vocabulary";

// The catalogue import file, read and checked without touching the database. Pure.
//
// The format: UTF-8 text (a byte-order mark is fine), commas between columns, a header line naming
// the columns, then one line per contents line of a set type, with the set type's own fields
// repeated on each of its lines:
//
//   code,name,set_class,packaging,method,flags,weight_kg,size_stu,notes,item,count
//   GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,2.4,0.5,,"Mayo scissors, curved 170 mm",1
//   GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,2.4,0.5,,Towel clip,4
//
// Columns may come in any order; flags and notes may be left out. Flags are separated by "|".
// Lines are numbered as a spreadsheet numbers its rows: the header is line 1 (a quoted value that
// spans several lines counts as one). Files with semicolons or tabs between columns are refused
// with a message rather than guessed at, so that a decimal comma can never shift a column.

export const MAX_IMPORT_BYTES = 5 * 1024 * 1024;
export const MAX_IMPORT_ROWS = 5000;

export const IMPORT_COLUMNS = [
  { name: "code", required: true, description: "The set type's code, e.g. ORTH-MAJ-01: letters, digits and hyphens." },
  { name: "name", required: true, description: "The set type's name, unique in the customer's catalogue." },
  { name: "set_class", required: true, description: `One of ${SET_CLASSES.join(", ")}.` },
  { name: "packaging", required: true, description: `One of ${PACKAGINGS.join(", ")}.` },
  { name: "method", required: true, description: `One of ${STERILISATION_METHODS.join(", ")}.` },
  { name: "flags", required: false, description: `Any of ${PROCESSING_FLAGS.join(", ")}, separated by |.` },
  { name: "weight_kg", required: true, description: `Weight in kg, more than 0 and at most ${MAX_WEIGHT_KG}, up to 2 decimals (4.25).` },
  { name: "size_stu", required: true, description: `Size in sterilisation units, more than 0 and at most ${MAX_SIZE_STU}, up to 2 decimals (0.5).` },
  { name: "notes", required: false, description: "Processing notes, free text." },
  { name: "item", required: true, description: "One instrument of the contents list." },
  { name: "count", required: true, description: `How many of that instrument: a whole number from 1 to ${ITEM_COUNT_MAX}.` },
] as const;

export type ImportColumn = (typeof IMPORT_COLUMNS)[number]["name"];
const COLUMN_NAMES: readonly string[] = IMPORT_COLUMNS.map((c) => c.name);
/** The columns whose values belong to the set type and so repeat on each of its lines. */
const SET_TYPE_COLUMNS = ["name", "set_class", "packaging", "method", "flags", "weight_kg", "size_stu", "notes"] as const;

export interface ImportIssue {
  /** The line as a spreadsheet shows it (header = 1); null for the file as a whole. */
  line: number | null;
  /** The column's name in the header; null when the problem is the whole line or file. */
  column: string | null;
  message: string;
}

export interface ImportedSetType extends SetTypeValues {
  /** The first line of the set type in the file. */
  line: number;
}

export interface CatalogueFile {
  /** The set types whose every line is valid, in the order they first appear. */
  setTypes: ImportedSetType[];
  issues: ImportIssue[];
  /** Data lines read (blank lines are not counted). */
  rowCount: number;
}

/** "line 7, column count: …" — the way the import screen and error messages write an issue. */
export function formatIssue(issue: ImportIssue): string {
  const where = [issue.line !== null ? `line ${issue.line}` : null, issue.column !== null ? `column ${issue.column}` : null]
    .filter(Boolean)
    .join(", ");
  return where ? `${where}: ${issue.message}` : issue.message;
}

const fileIssue = (message: string): CatalogueFile => ({ setTypes: [], issues: [{ line: null, column: null, message }], rowCount: 0 });

// ---------------------------------------------------------------------------------------------
// Bytes → text

/** The offset of the first byte that breaks UTF-8 (RFC 3629), or -1 when the bytes are valid. */
export function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i]!;
    if (b < 0x80) {
      i += 1;
      continue;
    }
    let need: number;
    let min = 0x80;
    let max = 0xbf;
    if (b >= 0xc2 && b <= 0xdf) need = 1;
    else if (b >= 0xe0 && b <= 0xef) {
      need = 2;
      if (b === 0xe0) min = 0xa0;
      if (b === 0xed) max = 0x9f;
    } else if (b >= 0xf0 && b <= 0xf4) {
      need = 3;
      if (b === 0xf0) min = 0x90;
      if (b === 0xf4) max = 0x8f;
    } else return i;
    for (let k = 1; k <= need; k++) {
      const c = bytes[i + k];
      if (c === undefined) return i;
      if (k === 1 ? c < min || c > max : c < 0x80 || c > 0xbf) return i;
    }
    i += need + 1;
  }
  return -1;
}

function lineOfOffset(bytes: Uint8Array, offset: number): number {
  let line = 1;
  for (let i = 0; i < offset; i++) if (bytes[i] === 0x0a) line++;
  return line;
}

export type DecodedFile = { ok: true; text: string } | { ok: false; message: string };

/**
 * Decodes the file strictly as UTF-8 (dropping a byte-order mark). Latin-1 / Windows-1252 bytes,
 * UTF-16 and binary files are refused with a message that says where and what to do.
 */
export function decodeCatalogueBytes(bytes: Uint8Array): DecodedFile {
  if (bytes.length === 0) return { ok: false, message: "The file is empty: it needs a header line and at least one line of contents." };
  if (bytes.length > MAX_IMPORT_BYTES) {
    return { ok: false, message: `The file is ${(bytes.length / 1024 / 1024).toFixed(1)} MB; import at most 5 MB at a time (split the file).` };
  }
  if ((bytes[0] === 0xff && bytes[1] === 0xfe) || (bytes[0] === 0xfe && bytes[1] === 0xff)) {
    return { ok: false, message: 'This file is saved as UTF-16 text; save it as "CSV UTF-8" (comma-delimited) and choose it again.' };
  }
  const body = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf ? bytes.subarray(3) : bytes;
  const bad = firstInvalidUtf8(body);
  if (bad >= 0) {
    const hex = body[bad]!.toString(16).toUpperCase().padStart(2, "0");
    return {
      ok: false,
      message:
        `The file is not UTF-8 text: line ${lineOfOffset(body, bad)} has the byte 0x${hex}, which UTF-8 does not allow there ` +
        '(the file was probably saved as Latin-1 or Windows-1252). Save it as "CSV UTF-8" and choose it again.',
    };
  }
  for (let i = 0; i < body.length; i++) {
    const b = body[i]!;
    if (b === 0 || (b < 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d) || b === 0x7f) {
      return { ok: false, message: `This is not a text file (line ${lineOfOffset(body, i)} holds binary data); choose the CSV file.` };
    }
  }
  return { ok: true, text: new TextDecoder("utf-8", { fatal: true }).decode(body) };
}

// ---------------------------------------------------------------------------------------------
// Text → set types

/** Counts a character in the header line, outside double quotes. */
function countOutsideQuotes(line: string, char: string): number {
  let quoted = false;
  let n = 0;
  for (const c of line) {
    if (c === '"') quoted = !quoted;
    else if (c === char && !quoted) n++;
  }
  return n;
}

function quoted(value: string): string {
  return `"${value.length > 60 ? `${value.slice(0, 57)}…` : value}"`;
}

type Cell<T> = { ok: true; value: T } | { ok: false; message: string };
const bad = (message: string): Cell<never> => ({ ok: false, message });

function readCode(raw: string): Cell<string> {
  if (raw === "") return bad("the code is empty; every line names its set type's code");
  const code = raw.toUpperCase();
  if (code.length > CODE_MAX) return bad(`${quoted(raw)} is longer than ${CODE_MAX} characters`);
  if (!CODE_PATTERN.test(code)) return bad(`${quoted(raw)} may hold only letters, digits and hyphens, e.g. ORTH-MAJ-01`);
  return { ok: true, value: code };
}

function readText(raw: string, what: string, max: number, required: boolean): Cell<string | null> {
  if (raw === "") return required ? bad(`the ${what} is empty`) : { ok: true, value: null };
  if (raw.length > max) return bad(`the ${what} is longer than ${max} characters`);
  if (/[\u0000-\u0008\u000b-\u001f\u007f]/.test(raw)) return bad(`the ${what} holds control characters`);
  if (required && /[\n\r\t]/.test(raw)) return bad(`the ${what} spans several lines; keep it on one`);
  return { ok: true, value: raw };
}

function readChoice<T extends string>(raw: string, what: string, allowed: readonly T[], is: (v: string) => v is T): Cell<T> {
  const value = raw.toLowerCase();
  if (raw === "") return bad(`the ${what} is empty; use one of ${allowed.join(", ")}`);
  if (!is(value)) return bad(`${quoted(raw)} is not a ${what}; use one of ${allowed.join(", ")}`);
  return { ok: true, value };
}

function readFlags(raw: string): Cell<ProcessingFlag[]> {
  const parts = raw
    .split("|")
    .map((p) => p.trim().toLowerCase())
    .filter(Boolean);
  const unknown = parts.find((p) => !isProcessingFlag(p));
  if (unknown !== undefined) {
    return bad(`${quoted(unknown)} is not a processing flag; use ${PROCESSING_FLAGS.join(", ")}, separated by |`);
  }
  return { ok: true, value: PROCESSING_FLAGS.filter((f) => parts.includes(f)) };
}

function readMeasure(raw: string, what: string, unit: string, max: number): Cell<number> {
  const reading = readDecimal(raw);
  if (!reading.ok) {
    if (reading.reason === "empty") return bad(`the ${what} is empty`);
    return bad(`${quoted(raw)} is not a ${what} in ${unit}: ${decimalProblem(reading.reason)}`);
  }
  if (reading.hundredths === 0) return bad(`${quoted(raw)} is not a ${what} in ${unit}: it must be more than 0`);
  if (reading.hundredths > max * 100) return bad(`${quoted(raw)} is more than ${max} ${unit}`);
  return { ok: true, value: reading.hundredths };
}

function readCount(raw: string): Cell<number> {
  if (raw === "") return bad("the count is empty");
  if (!/^\d+$/.test(raw) || Number(raw) === 0) return bad(`${raw} is not a positive whole number`);
  if (Number(raw) > ITEM_COUNT_MAX) return bad(`${raw} is more than ${ITEM_COUNT_MAX}; check the count`);
  return { ok: true, value: Number(raw) };
}

interface Group {
  line: number;
  code: string;
  /** The set type's fields as first read, by column (raw text and parsed value). */
  fields: Map<string, { raw: string; value: unknown; line: number }>;
  items: SetTypeItemValues[];
  itemLines: Map<string, number>;
  valid: boolean;
}

/** Reads the text of a catalogue import file: every problem with its line and column, and the set types. */
export function parseCatalogueCsv(text: string): CatalogueFile {
  if (text.trim() === "") return fileIssue("The file is empty: it needs a header line and at least one line of contents.");

  const firstLine = text.split(/\r\n|\n|\r/, 1)[0] ?? "";
  const commas = countOutsideQuotes(firstLine, ",");
  const semicolons = countOutsideQuotes(firstLine, ";");
  const tabs = countOutsideQuotes(firstLine, "\t");
  if (semicolons > commas) return fileIssue("This file uses ';' between columns; export it with commas (CSV UTF-8, comma-delimited).");
  if (tabs > commas) return fileIssue("This file uses tabs between columns; export it with commas (CSV UTF-8, comma-delimited).");

  const parsed = Papa.parse<string[]>(text, { delimiter: ",", skipEmptyLines: false, header: false });
  // An unclosed quote swallows the rest of the file, so it is the one to report when there is one.
  const quoteError = parsed.errors.find((e) => e.code === "MissingQuotes") ?? parsed.errors.find((e) => e.type === "Quotes");
  if (quoteError) {
    const line = (quoteError.row ?? 0) + 1;
    return {
      setTypes: [],
      rowCount: 0,
      issues: [
        {
          line,
          column: null,
          message:
            quoteError.code === "MissingQuotes"
              ? 'a quoted value is not closed (a " without its partner), so the rest of the file cannot be read; check the quotes on this line'
              : 'a quoted value is not closed where it should be: it must end with " right before the next comma or the end of the line (inside a value, write a quote as ""); check the quotes on this line',
        },
      ],
    };
  }
  const records = parsed.data;
  const header = (records[0] ?? []).map((h) => h.trim().toLowerCase());

  // The header: known columns, each once, every required one present.
  const issues: ImportIssue[] = [];
  const position = new Map<string, number>();
  header.forEach((name, index) => {
    if (name === "") {
      issues.push({ line: 1, column: null, message: `column ${index + 1} has no name; name it or delete it` });
    } else if (!COLUMN_NAMES.includes(name)) {
      issues.push({ line: 1, column: name, message: `not a column of the catalogue import; the columns are ${COLUMN_NAMES.join(", ")}` });
    } else if (position.has(name)) {
      issues.push({ line: 1, column: name, message: "appears twice in the header" });
    } else position.set(name, index);
  });
  for (const column of IMPORT_COLUMNS) {
    if (column.required && !position.has(column.name)) {
      issues.push({ line: 1, column: column.name, message: "is missing from the header" });
    }
  }
  if (issues.length) return { setTypes: [], issues, rowCount: 0 };

  const dataLines: { line: number; cells: string[] }[] = [];
  records.slice(1).forEach((cells, index) => {
    if (cells.every((c) => c.trim() === "")) return; // blank lines (and the final newline) are skipped
    dataLines.push({ line: index + 2, cells });
  });
  if (dataLines.length === 0) return fileIssue("The file has a header but no lines of contents.");
  if (dataLines.length > MAX_IMPORT_ROWS) {
    return fileIssue(
      `The file has ${dataLines.length.toLocaleString("en-GB")} lines of contents; import at most ${MAX_IMPORT_ROWS.toLocaleString("en-GB")} at a time (split the file).`,
    );
  }

  const groups = new Map<string, Group>();
  const names = new Map<string, { code: string; line: number }>();

  for (const { line, cells } of dataLines) {
    const problem = (column: string | null, message: string) => issues.push({ line, column, message });
    if (cells.length > header.length && cells.slice(header.length).some((c) => c.trim() !== "")) {
      problem(null, `${cells.length} values but the header names ${header.length} columns; put quotes around a value that holds a comma`);
      continue;
    }
    if (cells.length < header.length) {
      problem(null, `${cells.length} values but the header names ${header.length} columns`);
      continue;
    }
    const raw = (column: ImportColumn) => {
      const index = position.get(column);
      return index === undefined ? "" : (cells[index] ?? "").trim();
    };

    const readings: Record<(typeof SET_TYPE_COLUMNS)[number], Cell<unknown>> = {
      name: readText(raw("name"), "name", NAME_MAX, true),
      set_class: readChoice(raw("set_class"), "set class", SET_CLASSES, isSetClass),
      packaging: readChoice(raw("packaging"), "packaging", PACKAGINGS, isPackaging),
      method: readChoice(raw("method"), "sterilisation method", STERILISATION_METHODS, isSterilisationMethod),
      flags: readFlags(raw("flags")),
      weight_kg: readMeasure(raw("weight_kg"), "weight", "kg", MAX_WEIGHT_KG),
      size_stu: readMeasure(raw("size_stu"), "size", "StU", MAX_SIZE_STU),
      notes: readText(raw("notes"), "notes", NOTES_MAX, false),
    };
    const code = readCode(raw("code"));
    const item = readText(raw("item"), "instrument name", ITEM_NAME_MAX, true);
    const count = readCount(raw("count"));

    let rowValid = true;
    if (!code.ok) {
      problem("code", code.message);
      rowValid = false;
    }
    for (const column of SET_TYPE_COLUMNS) {
      const reading = readings[column];
      if (!reading.ok) {
        problem(column, reading.message);
        rowValid = false;
      }
    }
    if (!item.ok) problem("item", item.message);
    if (!count.ok) problem("count", count.message);
    if (!code.ok) continue;

    let group = groups.get(code.value);
    if (!group) {
      group = { line, code: code.value, fields: new Map(), items: [], itemLines: new Map(), valid: true };
      groups.set(code.value, group);
      const name = readings.name;
      if (name.ok && typeof name.value === "string") {
        const other = names.get(name.value.toLowerCase());
        if (other) {
          problem("name", `${quoted(name.value)} is also the name of set type ${other.code} (line ${other.line}); names must differ within a catalogue`);
          rowValid = false;
        } else names.set(name.value.toLowerCase(), { code: code.value, line });
      }
    }
    // The set type's own fields must read the same on each of its lines.
    for (const column of SET_TYPE_COLUMNS) {
      const reading = readings[column];
      if (!reading.ok) continue;
      const first = group.fields.get(column);
      if (!first) {
        group.fields.set(column, { raw: raw(column), value: reading.value, line });
      } else if (JSON.stringify(first.value) !== JSON.stringify(reading.value)) {
        problem(
          column,
          `differs from line ${first.line} for set type ${group.code} (${quoted(first.raw)} there, ${quoted(raw(column))} here); repeat the same value on every line of one set type`,
        );
        rowValid = false;
      }
    }
    if (item.ok && item.value !== null) {
      const key = item.value.toLowerCase();
      const earlier = group.itemLines.get(key);
      if (earlier !== undefined) {
        problem("item", `${quoted(item.value)} is already listed for set type ${group.code} on line ${earlier}; put the total count on one line`);
        rowValid = false;
      } else {
        group.itemLines.set(key, line);
        if (count.ok) group.items.push({ name: item.value, quantity: count.value });
      }
    }
    if (!rowValid || !item.ok || !count.ok) group.valid = false;
  }

  const setTypes: ImportedSetType[] = [];
  for (const group of groups.values()) {
    if (group.items.length > ITEMS_MAX) {
      issues.push({ line: group.line, column: "item", message: `set type ${group.code} has ${group.items.length} contents lines; at most ${ITEMS_MAX}` });
      group.valid = false;
    }
    if (!group.valid || group.fields.size !== SET_TYPE_COLUMNS.length) continue;
    const value = (column: (typeof SET_TYPE_COLUMNS)[number]) => group.fields.get(column)!.value;
    setTypes.push({
      line: group.line,
      code: group.code,
      name: value("name") as string,
      setClass: value("set_class") as ImportedSetType["setClass"],
      packaging: value("packaging") as ImportedSetType["packaging"],
      sterilisationMethod: value("method") as ImportedSetType["sterilisationMethod"],
      flags: value("flags") as ProcessingFlag[],
      weightG: hundredthsOfKgToGrams(value("weight_kg") as number),
      sizeStu: (value("size_stu") as number) / 100,
      processingNotes: value("notes") as string | null,
      items: group.items,
    });
  }
  issues.sort((a, b) => (a.line ?? 0) - (b.line ?? 0) || columnOrder(a.column) - columnOrder(b.column));
  return { setTypes, issues, rowCount: dataLines.length };
}

function columnOrder(column: string | null): number {
  return column === null ? -1 : COLUMN_NAMES.indexOf(column);
}

/** Bytes as uploaded → problems and set types. */
export function readCatalogueFile(bytes: Uint8Array): CatalogueFile {
  const decoded = decodeCatalogueBytes(bytes);
  if (!decoded.ok) return fileIssue(decoded.message);
  return parseCatalogueCsv(decoded.text);
}
