import { describe, expect, it } from "vitest";
import {
  CycleRecordError,
  MAX_RECORD_ISSUES,
  parseSterilizerRecord,
  parseWasherRecord,
  type CycleRecordIssue,
} from "@/lib/cycles";

// The first issue of the error a parse throws.
function failure(parse: () => unknown): { error: CycleRecordError; first: CycleRecordIssue } {
  try {
    parse();
  } catch (e) {
    if (e instanceof CycleRecordError) return { error: e, first: e.issues[0] };
    throw e;
  }
  throw new Error("expected the record to be refused");
}

const lines = (...rows: string[]) => rows.join("\n") + "\n";

describe("parseWasherRecord, accepted files", () => {
  it("reads elapsed seconds, °C and stage labels, with time measured from the first sample", () => {
    const record = parseWasherRecord(lines("t_s,temp_c,phase", "5,20.5,heating", "15,90,disinfection", "25,90.25,  "));
    expect(record.samples).toEqual([
      { t: 0, tempC: 20.5, phase: "heating" },
      { t: 10, tempC: 90, phase: "disinfection" },
      { t: 20, tempC: 90.25 },
    ]);
    expect(record.columns?.time).toEqual({ header: "t_s", kind: "elapsed_seconds" });
    expect(record.startedAt).toBeUndefined();
  });

  it.each(["seconds", "elapsed_s", "time_s", "Time (s)", "T_S"])("accepts %s as elapsed seconds", (header) => {
    const record = parseWasherRecord(lines(`${header},temp_c`, "0,80", "1,81"));
    expect(record.samples.map((s) => s.t)).toEqual([0, 1]);
  });

  it("converts Fahrenheit headers to °C", () => {
    // °C = (°F − 32)·5/9: 194 °F = 90 °C, 212 °F = 100 °C (definition of the Fahrenheit scale).
    for (const header of ["temp_f", "Temperature (°F)", "temperature [F]"]) {
      const record = parseWasherRecord(lines(`t_s,${header}`, "0,194", "1,212"));
      expect(record.samples.map((s) => s.tempC)).toEqual([90, 100]);
      expect(record.columns?.temperature.unit).toBe("F");
    }
  });

  it("reads °C headers in their usual spellings and kelvin", () => {
    for (const header of ["temp_c", "Temperature (°C)", "temperature (degC)", "TEMP [C]"]) {
      expect(parseWasherRecord(lines(`t_s,${header}`, "0,90", "1,91")).samples[1].tempC).toBe(91);
    }
    expect(parseWasherRecord(lines("t_s,temp_k", "0,363.15", "1,364.15")).samples[0].tempC).toBeCloseTo(90, 10);
  });

  it("reads ISO-8601 timestamps with a zone and keeps the start in UTC", () => {
    const record = parseWasherRecord(
      lines("timestamp,temp_c", "2026-03-02T08:15:00+01:00,20", "2026-03-02T07:15:30Z,60", "2026-03-02 08:16:00.5+0100,90"),
    );
    expect(record.startedAt).toBe("2026-03-02T07:15:00.000Z");
    expect(record.samples.map((s) => s.t)).toEqual([0, 30, 60.5]);
    expect(record.columns?.time.kind).toBe("timestamp");
  });

  it("accepts semicolon files with decimal commas and tab-separated files", () => {
    const semicolon = parseWasherRecord(lines("t_s;temp_c;phase", "0;89,5;disinfection", "1;90,25;disinfection"));
    expect(semicolon.samples.map((s) => s.tempC)).toEqual([89.5, 90.25]);
    const tabs = parseWasherRecord(lines("t_s\ttemp_c", "0\t90.5", "1\t91"));
    expect(tabs.samples.map((s) => s.tempC)).toEqual([90.5, 91]);
  });

  it("skips blank lines, a byte-order mark and CRLF line ends, and lists unused columns", () => {
    const record = parseWasherRecord("\uFEFFt_s,temp_c,probe_2,pressure_kpa_abs\r\n0,90,88,101\r\n\r\n1,91,89,101\r\n");
    expect(record.samples).toEqual([
      { t: 0, tempC: 90 },
      { t: 1, tempC: 91 },
    ]);
    expect(record.ignoredColumns).toEqual(["probe_2", "pressure_kpa_abs"]);
  });

  it("ignores pressure columns of any unit in a washer record", () => {
    expect(parseWasherRecord(lines("t_s,temp_c,pressure", "0,90,1", "1,90,1")).samples).toHaveLength(2);
  });
});

describe("parseSterilizerRecord, pressure units", () => {
  // Standard atmosphere 101.325 kPa (ISO 2533) is added to gauge readings.
  it.each([
    ["pressure_kpa_abs", "304.2", 304.2],
    ["pressure (kPa abs)", "304.2", 304.2],
    ["pressure_kpa_g", "200", 301.325],
    ["pressure (kPa gauge)", "200", 301.325],
    ["pressure_bar_abs", "3.042", 304.2],
    ["p_bara", "3.042", 304.2],
    ["pressure (bar g)", "2", 301.325],
    ["pressure_barg", "2", 301.325],
    ["pressure_mbar", "3042", 304.2],
    ["pressure (mbar g)", "2000", 301.325],
    ["pressure_mpa_abs", "0.3042", 304.2],
    // 1 psi = 6.894757293168 kPa exactly (inch-pound definition): 29.1 psig = 200.6374 + 101.325 kPa.
    ["pressure_psig", "29.1", 29.1 * 6.894757293168 + 101.325],
  ])("%s %s → %s kPa abs", (header, value, expected) => {
    const record = parseSterilizerRecord(lines(`t_s,temp_c,${header}`, `0,134,${value}`, `1,134,${value}`));
    expect(record.samples[0].pressureKpaAbs).toBeCloseTo(expected, 9);
  });

  it("takes a configured atmosphere for gauge readings", () => {
    const record = parseSterilizerRecord(lines("t_s,temp_c,pressure_bar_g", "0,134,2", "1,134,2"), { atmosphereKpa: 95 });
    expect(record.samples[0].pressureKpaAbs).toBeCloseTo(295, 12);
    expect(record.columns?.pressure).toEqual({ header: "pressure_bar_g", unit: "bar", reference: "gauge", atmosphereKpa: 95 });
    expect(() => parseSterilizerRecord("t_s,temp_c,pressure_bar_g\n0,1,1\n", { atmosphereKpa: 0 })).toThrow(RangeError);
  });
});

describe("refused records name the line and column and say what to fix", () => {
  it("an empty file", () => {
    for (const text of ["", "  \n\n", "\uFEFF"]) {
      const { first } = failure(() => parseWasherRecord(text));
      expect(first.code).toBe("empty");
      expect(first.message).toMatch(/empty; export the cycle record as CSV with a header row/);
    }
  });

  it("a file without a header row", () => {
    const { first } = failure(() => parseWasherRecord(lines("0,20", "1,30")));
    expect(first).toMatchObject({ code: "no_header", line: 1 });
    expect(first.message).toMatch(/^Line 1: .*must name the columns; add a header row such as t_s,temp_c/);
  });

  it("missing columns", () => {
    const noTemp = failure(() => parseWasherRecord(lines("t_s,phase", "0,a", "1,b"))).first;
    expect(noTemp).toMatchObject({ code: "missing_column", line: 1 });
    expect(noTemp.message).toMatch(/no temperature column \(found: t_s, phase\); add temp_c/);

    const noTime = failure(() => parseWasherRecord(lines("temp_c", "90", "91"))).first;
    expect(noTime.message).toMatch(/no time column .*add t_s/);

    const noPressure = failure(() => parseSterilizerRecord(lines("t_s,temp_c", "0,134", "1,134"))).first;
    expect(noPressure.message).toMatch(/no pressure column .*steriliser record needs one, e.g. pressure_kpa_abs/);
  });

  it("a temperature or pressure column without a known unit", () => {
    const noUnit = failure(() => parseWasherRecord(lines("t_s,temperature", "0,90", "1,90"))).first;
    expect(noUnit).toMatchObject({ code: "unknown_unit", line: 1, column: 2, columnName: "temperature" });
    expect(noUnit.message).toBe(
      'Line 1, column 2 (temperature): the temperature column "temperature" does not say its unit; name it temp_c (°C) or temp_f (°F)',
    );

    const rankine = failure(() => parseWasherRecord(lines("t_s,temp (°R)", "0,90", "1,90"))).first;
    expect(rankine).toMatchObject({ code: "unknown_unit", column: 2 });
    expect(rankine.message).toMatch(/temperature unit in "temp \(°R\)" is not known/);

    const torr = failure(() => parseSterilizerRecord(lines("t_s,temp_c,pressure_torr_abs", "0,134,1", "1,134,1"))).first;
    expect(torr).toMatchObject({ code: "unknown_unit", column: 3 });
    expect(torr.message).toMatch(/pressure unit in "pressure_torr_abs" is not known; name the column e.g. pressure_kpa_abs/);

    const noReference = failure(() => parseSterilizerRecord(lines("t_s,temp_c,pressure_kpa", "0,134,300", "1,134,300"))).first;
    expect(noReference.message).toMatch(/does not say whether "pressure_kpa" is absolute or gauge/);

    const minutes = failure(() => parseWasherRecord(lines("time (min),temp_c", "0,90", "1,90"))).first;
    expect(minutes).toMatchObject({ code: "unknown_unit", column: 1 });
    expect(minutes.message).toMatch(/give elapsed seconds in a column named t_s/);
  });

  it("two columns for the same quantity", () => {
    const { first } = failure(() => parseWasherRecord(lines("t_s,temp_c,temp_f", "0,90,194", "1,90,194")));
    expect(first).toMatchObject({ code: "duplicate_column", line: 1, column: 3 });
    expect(first.message).toMatch(/column 2 already holds the temperature; keep one temperature column/);
  });

  it("a non-numeric value", () => {
    const { first } = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90", "1,ninety", "2,90")));
    expect(first).toMatchObject({ code: "not_a_number", line: 3, column: 2, columnName: "temp_c" });
    expect(first.message).toBe(
      'Line 3, column 2 (temp_c): "ninety" is not a number; write the temperature in °C as a plain decimal number, e.g. 93.4',
    );
    const time = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90", "00:01,90"))).first;
    expect(time).toMatchObject({ code: "not_a_number", line: 3, column: 1 });
    const pressure = failure(() => parseSterilizerRecord(lines("t_s,temp_c,pressure_kpa_abs", "0,134,3O4", "1,134,304"))).first;
    expect(pressure).toMatchObject({ code: "not_a_number", line: 2, column: 3 });
  });

  it("a decimal comma in a comma-separated file", () => {
    const { first } = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90,5", "1,90,5")));
    expect(first).toMatchObject({ code: "field_count", line: 2 });
    expect(first.message).toMatch(/has 3 fields but the header has 2; .*separate the columns with semicolons/);
  });

  it("an empty cell", () => {
    const { first } = failure(() => parseSterilizerRecord(lines("t_s,temp_c,pressure_kpa_abs", "0,134,", "1,134,304")));
    expect(first).toMatchObject({ code: "missing_value", line: 2, column: 3 });
  });

  it("timestamps without a zone or not dates at all", () => {
    const noZone = failure(() => parseWasherRecord(lines("timestamp,temp_c", "2026-03-02T07:15:00,90", "2026-03-02T07:16:00,90"))).first;
    expect(noZone).toMatchObject({ code: "bad_timestamp", line: 2, column: 1 });
    expect(noZone.message).toMatch(/not an ISO-8601 timestamp with a time zone; write it like 2026-03-02T07:15:00Z/);
    const numbers = failure(() => parseWasherRecord(lines("time,temp_c", "0,90", "1,90"))).first;
    expect(numbers.message).toMatch(/if the column holds elapsed seconds, name it t_s instead of "time"/);
    const impossible = failure(() => parseWasherRecord(lines("timestamp,temp_c", "2026-02-30T07:15:00Z,90", "2026-03-02T07:16:00Z,90"))).first;
    expect(impossible).toMatchObject({ code: "bad_timestamp", line: 2 });
  });

  it("unsorted and duplicate times, with the line they clash with", () => {
    const unsorted = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90", "10,90", "5,90"))).first;
    expect(unsorted).toMatchObject({ code: "unsorted_time", line: 4, column: 1 });
    expect(unsorted.message).toBe("Line 4, column 1 (t_s): the time is earlier than on line 3; sort the rows by time, earliest first");
    const duplicate = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90", "10,90", "10,91"))).first;
    expect(duplicate).toMatchObject({ code: "duplicate_time", line: 4 });
    expect(duplicate.message).toMatch(/the time repeats line 3/);
  });

  it("fewer than 2 samples", () => {
    const { first } = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90")));
    expect(first.code).toBe("too_few_samples");
    expect(first.message).toBe("The record holds 1 sample; at least 2 rows of values are needed below the header");
    expect(failure(() => parseWasherRecord("t_s,temp_c\n")).first.message).toMatch(/holds 0 samples/);
  });

  it("a file separated by another character", () => {
    const { first } = failure(() => parseWasherRecord(lines("t_s|temp_c", "0|90", "1|90")));
    expect(first).toMatchObject({ code: "delimiter", line: 1 });
    expect(first.message).toMatch(/single column "t_s\|temp_c"; separate the columns with commas \(semicolons and tabs are also accepted\)/);
  });

  it("an unclosed quote", () => {
    const { first } = failure(() => parseWasherRecord(lines("t_s,temp_c,phase", '0,90,"disinfection', "1,90,drying")));
    expect(first).toMatchObject({ code: "quotes", line: 2 });
    expect(first.message).toMatch(/^Line 2: .*close every opening double quote/);
  });

  it("implausible values that point at a wrong unit or reference", () => {
    const hot = failure(() => parseWasherRecord(lines("t_s,temp_c", "0,90", "1,363"))).first;
    expect(hot).toMatchObject({ code: "out_of_range", line: 3, column: 2 });
    expect(hot.message).toMatch(/363 °C is outside -20…200 °C; check the value and the unit in the header/);
    const vacuum = failure(() => parseSterilizerRecord(lines("t_s,temp_c,pressure_kpa_g", "0,134,-150", "1,134,200"))).first;
    expect(vacuum).toMatchObject({ code: "out_of_range", line: 2, column: 3 });
    expect(vacuum.message).toMatch(/below perfect vacuum; check whether the column is gauge or absolute/);
  });

  it("counts lines across blank lines and collects several problems", () => {
    const { error } = failure(() => parseWasherRecord(lines("t_s,temp_c", "", "0,90", "", "", "1,x", "2,y")));
    expect(error.issues.map((i) => i.line)).toEqual([6, 7]);
    expect(error.message).toMatch(/^Line 6, column 2 \(temp_c\): .* \(and 1 more problem\)$/);
    expect(error.line).toBe(6);
    expect(error.column).toBe(2);
  });

  it("stops after MAX_RECORD_ISSUES problems", () => {
    const rows = Array.from({ length: 50 }, (_, i) => `${i},bad`);
    const { error } = failure(() => parseWasherRecord(lines("t_s,temp_c", ...rows)));
    expect(error.issues).toHaveLength(MAX_RECORD_ISSUES);
    expect(error.issues[MAX_RECORD_ISSUES - 1].line).toBe(MAX_RECORD_ISSUES + 1);
  });
});
