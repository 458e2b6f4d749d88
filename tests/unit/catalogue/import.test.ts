import fc from "fast-check";
import { describe, expect, it } from "vitest";
import {
  decodeCatalogueBytes,
  firstInvalidUtf8,
  formatIssue,
  type ImportIssue,
  MAX_IMPORT_ROWS,
  parseCatalogueCsv,
  readCatalogueFile,
} from "@/lib/catalogue/import";

const HEADER = "code,name,set_class,packaging,method,flags,weight_kg,size_stu,notes,item,count";
const utf8 = (text: string) => new TextEncoder().encode(text);
const csv = (...lines: string[]) => [HEADER, ...lines].join("\n") + "\n";

const MINOR_1 = 'GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,"Needle holder, Mayo-Hegar 160 mm",1';
const MINOR_2 = "GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,\"Towel clip, Backhaus 110 mm\",4";
const SCOPE = "LAP-SCP-01,Laparoscope 10 mm 30°,single_instrument,double_pouch,low_temperature,manual_wash_only|lumens_to_flush,0.45,0.1,Not for steam.,Laparoscope 10 mm 30°,1";

/** The one issue of a file with exactly one problem. */
function onlyIssue(text: string): ImportIssue {
  const result = parseCatalogueCsv(text);
  expect(result.issues).toHaveLength(1);
  return result.issues[0]!;
}

describe("reading a good catalogue file", () => {
  it("groups the lines of each set type, keeps their order and converts kg to grams", () => {
    const result = parseCatalogueCsv(csv(MINOR_1, MINOR_2, SCOPE));
    expect(result.issues).toEqual([]);
    expect(result.rowCount).toBe(3);
    expect(result.setTypes).toEqual([
      {
        line: 2,
        code: "GEN-MIN-01",
        name: "Minor general set",
        setClass: "basic_tray",
        packaging: "wrap",
        sterilisationMethod: "steam_134",
        flags: ["ultrasonic"],
        weightG: 1850,
        sizeStu: 0.5,
        processingNotes: null,
        items: [
          { name: "Needle holder, Mayo-Hegar 160 mm", quantity: 1 },
          { name: "Towel clip, Backhaus 110 mm", quantity: 4 },
        ],
      },
      {
        line: 4,
        code: "LAP-SCP-01",
        name: "Laparoscope 10 mm 30°",
        setClass: "single_instrument",
        packaging: "double_pouch",
        sterilisationMethod: "low_temperature",
        // Stored in the vocabulary's order, whatever order the file lists them in.
        flags: ["manual_wash_only", "lumens_to_flush"],
        weightG: 450,
        sizeStu: 0.1,
        processingNotes: "Not for steam.",
        items: [{ name: "Laparoscope 10 mm 30°", quantity: 1 }],
      },
    ]);
  });

  it("accepts columns in any order, without the optional ones, in any letter case, with CRLF line ends", () => {
    const text = "Count,Item,Code,Name,Set_Class,Packaging,Method,Weight_kg,Size_stu\r\n2,Gallipot 60 ml,gen-min-01,Minor set,BASIC_TRAY,Wrap,steam_134,2,0.25\r\n";
    const result = parseCatalogueCsv(text);
    expect(result.issues).toEqual([]);
    expect(result.setTypes[0]).toMatchObject({ code: "GEN-MIN-01", setClass: "basic_tray", packaging: "wrap", weightG: 2000, sizeStu: 0.25, flags: [] });
    expect(result.setTypes[0]!.items).toEqual([{ name: "Gallipot 60 ml", quantity: 2 }]);
  });

  it("drops a UTF-8 byte-order mark and reads accented text", () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(csv("ENT-01,Instruments à la carte,basic_tray,wrap,steam_134,,1,0.5,,Tonsil snare,1"))]);
    const result = readCatalogueFile(bytes);
    expect(result.issues).toEqual([]);
    expect(result.setTypes[0]!.code).toBe("ENT-01");
    expect(result.setTypes[0]!.name).toBe("Instruments à la carte");
  });

  it("numbers lines as a spreadsheet does: blank lines count, a quoted value over two lines is one line", () => {
    const text = csv(MINOR_1, "", 'GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,"Towel clip,\nBackhaus",4', "GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,Gallipot,-1");
    const result = parseCatalogueCsv(text);
    // Header 1, first line 2, blank 3, the two-line value 4 (one record), the bad count 5.
    expect(result.issues.map((i) => [i.line, i.column])).toEqual([
      [4, "item"],
      [5, "count"],
    ]);
    expect(result.issues[0]!.message).toMatch(/spans several lines/);
  });
});

describe("refusing a bad file as a whole", () => {
  it("an empty file, or one with a header only", () => {
    expect(readCatalogueFile(new Uint8Array()).issues[0]!.message).toMatch(/The file is empty/);
    expect(onlyIssue("  \n\n").message).toMatch(/The file is empty/);
    expect(onlyIssue(`${HEADER}\n\n`).message).toBe("The file has a header but no lines of contents.");
  });

  it("semicolons or tabs between columns, with the separator named", () => {
    const semicolons = onlyIssue(HEADER.replaceAll(",", ";") + "\nGEN-01;Set;basic_tray;wrap;steam_134;;1,5;0,5;;Clip;1\n");
    expect(semicolons).toEqual({ line: null, column: null, message: "This file uses ';' between columns; export it with commas (CSV UTF-8, comma-delimited)." });
    expect(onlyIssue(HEADER.replaceAll(",", "\t") + "\n").message).toMatch(/uses tabs between columns/);
  });

  it("an unbalanced quote, on the line where the quoted value starts", () => {
    const issue = onlyIssue(csv(MINOR_1, 'GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,"Towel clip, Backhaus 110 mm,4', MINOR_2));
    expect(issue.line).toBe(3);
    expect(issue.message).toMatch(/quoted value is not closed/);
  });

  it("text after a closing quote", () => {
    const issue = onlyIssue(csv(MINOR_1, 'GEN-MIN-01,Minor general set,basic_tray,wrap,steam_134,ultrasonic,1.85,0.5,,"Towel clip" 110 mm,4'));
    expect(issue.line).toBe(3);
    expect(issue.message).toMatch(/quoted value is not closed/);
  });

  it("missing, unknown, unnamed and repeated columns, each named", () => {
    const result = parseCatalogueCsv("code,name,set_class,packaging,method,colour,weight_kg,size_stu,item,item,\nX,Y,basic_tray,wrap,steam_134,red,1,1,a,b,\n");
    // Left to right through the header, then what is missing.
    expect(result.issues.map(formatIssue)).toEqual([
      expect.stringMatching(/^line 1, column colour: not a column of the catalogue import; the columns are code, name, /),
      "line 1, column item: appears twice in the header",
      "line 1: column 11 has no name; name it or delete it",
      "line 1, column count: is missing from the header",
    ]);
    expect(result.setTypes).toEqual([]);
  });

  it(`more than ${MAX_IMPORT_ROWS} lines`, () => {
    const lines = Array.from({ length: MAX_IMPORT_ROWS + 1 }, (_, i) => `T-${i},Set ${i},basic_tray,wrap,steam_134,,1,0.5,,Clip,1`);
    expect(onlyIssue(csv(...lines)).message).toBe("The file has 5,001 lines of contents; import at most 5,000 at a time (split the file).");
    const exactly = parseCatalogueCsv(csv(...lines.slice(0, MAX_IMPORT_ROWS)));
    expect(exactly.issues).toEqual([]);
    expect(exactly.setTypes).toHaveLength(MAX_IMPORT_ROWS);
  });
});

describe("refusing bad values, each with its line and column", () => {
  const line = (overrides: Partial<Record<string, string>>) => {
    const values: Record<string, string> = {
      code: "GEN-01",
      name: "General set",
      set_class: "basic_tray",
      packaging: "wrap",
      method: "steam_134",
      flags: "",
      weight_kg: "2.5",
      size_stu: "0.5",
      notes: "",
      item: "Towel clip",
      count: "4",
      ...overrides,
    };
    return HEADER.split(",").map((c) => values[c]).join(",");
  };
  const issueFor = (overrides: Partial<Record<string, string>>) => formatIssue(onlyIssue(csv(MINOR_1, MINOR_2, line(overrides))));

  it.each([
    [{ count: "−2" }, "line 4, column count: −2 is not a positive whole number"],
    [{ count: "-2" }, "line 4, column count: -2 is not a positive whole number"],
    [{ count: "2.5" }, "line 4, column count: 2.5 is not a positive whole number"],
    [{ count: "0" }, "line 4, column count: 0 is not a positive whole number"],
    [{ count: "" }, "line 4, column count: the count is empty"],
    [{ count: "1500" }, "line 4, column count: 1500 is more than 999; check the count"],
    [{ set_class: "tray" }, 'line 4, column set_class: "tray" is not a set class; use one of single_instrument, basic_tray, major_tray, specialist_tray, rigid_container, dental_cassette, loaner_set'],
    [{ packaging: "box" }, 'line 4, column packaging: "box" is not a packaging; use one of wrap, rigid_container, single_pouch, double_pouch'],
    [{ method: "steam" }, 'line 4, column method: "steam" is not a sterilisation method; use one of steam_134, steam_121, low_temperature'],
    [{ flags: "ultrasonic|rinse" }, 'line 4, column flags: "rinse" is not a processing flag; use dismantle, ultrasonic, manual_wash_only, lumens_to_flush, separated by |'],
    [{ weight_kg: '"2,5"' }, 'line 4, column weight_kg: "2,5" is not a weight in kg: use a point as the decimal mark, e.g. 4.25'],
    [{ weight_kg: "2.555" }, 'line 4, column weight_kg: "2.555" is not a weight in kg: use at most 2 decimals'],
    [{ weight_kg: "0" }, 'line 4, column weight_kg: "0" is not a weight in kg: it must be more than 0'],
    [{ weight_kg: "75" }, 'line 4, column weight_kg: "75" is more than 50 kg'],
    [{ size_stu: "12.5" }, 'line 4, column size_stu: "12.5" is more than 12 StU'],
    [{ size_stu: "-1" }, 'line 4, column size_stu: "-1" is not a size in StU: it must be more than 0'],
    [{ size_stu: "half" }, 'line 4, column size_stu: "half" is not a size in StU: it is not a number'],
    [{ code: "GEN 01" }, 'line 4, column code: "GEN 01" may hold only letters, digits and hyphens, e.g. ORTH-MAJ-01'],
    [{ code: "" }, "line 4, column code: the code is empty; every line names its set type's code"],
    [{ name: "" }, "line 4, column name: the name is empty"],
    [{ item: "" }, "line 4, column item: the instrument name is empty"],
  ])("%o → %s", (overrides, expected) => {
    expect(issueFor(overrides)).toBe(expected);
  });

  it("accepts the limits themselves: 12 StU, 50 kg, 999 of an instrument", () => {
    const result = parseCatalogueCsv(csv(line({ size_stu: "12", weight_kg: "50", count: "999" })));
    expect(result.issues).toEqual([]);
    expect(result.setTypes[0]).toMatchObject({ sizeStu: 12, weightG: 50_000, items: [{ name: "Towel clip", quantity: 999 }] });
  });

  it("too many or too few values on a line", () => {
    expect(formatIssue(onlyIssue(csv(`${line({})},extra`)))).toBe(
      "line 2: 12 values but the header names 11 columns; put quotes around a value that holds a comma",
    );
    expect(formatIssue(onlyIssue(csv("GEN-01,General set,basic_tray")))).toBe("line 2: 3 values but the header names 11 columns");
    // A trailing empty value (a spreadsheet's stray comma) is fine.
    expect(parseCatalogueCsv(csv(`${line({})},`)).issues).toEqual([]);
  });

  it("lines of one set type that disagree", () => {
    const issue = onlyIssue(csv(MINOR_1, MINOR_2.replace(",1.85,", ",1.95,")));
    expect(formatIssue(issue)).toBe(
      'line 3, column weight_kg: differs from line 2 for set type GEN-MIN-01 ("1.85" there, "1.95" here); repeat the same value on every line of one set type',
    );
    const flags = onlyIssue(csv(MINOR_1, MINOR_2.replace(",ultrasonic,", ",ultrasonic|dismantle,")));
    expect([flags.line, flags.column]).toEqual([3, "flags"]);
  });

  it("two set types with one name, and an instrument listed twice", () => {
    const sameName = onlyIssue(csv(MINOR_1, "GEN-MIN-02,minor GENERAL set,basic_tray,wrap,steam_134,,1,0.5,,Clip,1"));
    expect(formatIssue(sameName)).toBe(
      'line 3, column name: "minor GENERAL set" is also the name of set type GEN-MIN-01 (line 2); names must differ within a catalogue',
    );
    const twice = onlyIssue(csv(MINOR_1, MINOR_2, MINOR_1.replace(/,1$/, ",2")));
    expect(formatIssue(twice)).toBe(
      'line 4, column item: "Needle holder, Mayo-Hegar 160 mm" is already listed for set type GEN-MIN-01 on line 2; put the total count on one line',
    );
  });

  it("lists every problem of every line and keeps only the set types without one", () => {
    const result = parseCatalogueCsv(csv(MINOR_1, line({ count: "x", method: "gas" }), SCOPE));
    expect(result.issues.map((i) => [i.line, i.column])).toEqual([
      [3, "method"],
      [3, "count"],
    ]);
    expect(result.setTypes.map((s) => s.code)).toEqual(["GEN-MIN-01", "LAP-SCP-01"]);
  });
});

describe("decoding the bytes", () => {
  it("refuses Latin-1 bytes, naming the line and the byte", () => {
    // "é" in ISO 8859-1 is the single byte 0xE9, never valid alone in UTF-8 (RFC 3629 §3).
    const latin1 = new Uint8Array([...utf8(`${HEADER}\n${MINOR_1}\nGEN-02,Caf`), 0xe9, ...utf8(" set,basic_tray,wrap,steam_134,,1,1,,Clip,1\n")]);
    const result = readCatalogueFile(latin1);
    expect(result.issues).toHaveLength(1);
    expect(result.issues[0]!.message).toBe(
      'The file is not UTF-8 text: line 3 has the byte 0xE9, which UTF-8 does not allow there (the file was probably saved as Latin-1 or Windows-1252). Save it as "CSV UTF-8" and choose it again.',
    );
  });

  it("refuses UTF-16 and binary files", () => {
    expect(decodeCatalogueBytes(new Uint8Array([0xff, 0xfe, 0x63, 0x00]))).toEqual({
      ok: false,
      message: 'This file is saved as UTF-16 text; save it as "CSV UTF-8" (comma-delimited) and choose it again.',
    });
    const binary = decodeCatalogueBytes(new Uint8Array([...utf8(`${HEADER}\n`), 0x00, 0x01]));
    expect(binary.ok).toBe(false);
    expect(!binary.ok && binary.message).toMatch(/not a text file \(line 2/);
  });

  it("finds the first invalid UTF-8 sequence (RFC 3629 §4 syntax)", () => {
    expect(firstInvalidUtf8(utf8("aé€😀"))).toBe(-1);
    expect(firstInvalidUtf8(new Uint8Array([0x61, 0xc0, 0xaf]))).toBe(1); // overlong "/" (RFC 3629 §10)
    expect(firstInvalidUtf8(new Uint8Array([0xed, 0xa0, 0x80]))).toBe(0); // a UTF-16 surrogate, U+D800
    expect(firstInvalidUtf8(new Uint8Array([0xf4, 0x90, 0x80, 0x80]))).toBe(0); // above U+10FFFF
    expect(firstInvalidUtf8(new Uint8Array([0x61, 0xe2, 0x82]))).toBe(1); // cut short
    expect(firstInvalidUtf8(new Uint8Array([0x80]))).toBe(0); // a lone continuation byte
  });

  it("agrees with the platform's strict UTF-8 decoder on any bytes", () => {
    // The WHATWG Encoding Standard's fatal UTF-8 decoder implements the same RFC 3629 rules.
    const strict = new TextDecoder("utf-8", { fatal: true });
    fc.assert(
      fc.property(fc.oneof(fc.uint8Array({ maxLength: 40 }), fc.string({ unit: "binary", maxLength: 20 }).map(utf8)), (bytes) => {
        let valid = true;
        try {
          strict.decode(bytes);
        } catch {
          valid = false;
        }
        expect(firstInvalidUtf8(bytes) === -1).toBe(valid);
      }),
      { numRuns: 3000 },
    );
  });
});
