import { describe, expect, it } from "vitest";
import { CycleRecordError } from "@/lib/cycles/errors";
import { parseWasherRecord } from "@/lib/cycles/parse";
import { checkWasherBatch } from "@/lib/cycles/washer";
import { enteredIssues, enteredSamplesToCsv } from "@/lib/washing/entered";

function issuesOf(text: string): string[] {
  try {
    parseWasherRecord(text);
  } catch (error) {
    if (error instanceof CycleRecordError) return enteredIssues(error);
    throw error;
  }
  throw new Error("expected the record to be refused");
}

describe("values typed in at the station", () => {
  it("become a record the washer check reads, decimal commas included", () => {
    const csv = enteredSamplesToCsv([
      { t: "0", tempC: "90", phase: "disinfection" },
      { t: "60", tempC: "90,0", phase: "disinfection" },
      { t: "120", tempC: " 85 ", phase: "drying" },
    ]);
    expect(csv).toBe("t_s;temp_c;phase\n0;90;disinfection\n60;90,0;disinfection\n120;85;drying");
    const check = checkWasherBatch(parseWasherRecord(csv), { kind: "a0", minA0: 600 });
    // 90 °C for 120 s gives A0 1200: 10^((90 − 80)/10) · 120 (EN ISO 15883-1 Annex B formula, computed).
    expect(check.figures.a0).toBeCloseTo(1200, 6);
    expect(check.passed).toBe(true);
  });

  it("leave the stage column out when no row has a stage", () => {
    expect(enteredSamplesToCsv([{ t: "0", tempC: "20", phase: "" }, { t: "10", tempC: "30", phase: "" }])).toBe("t_s;temp_c\n0;20\n10;30");
  });

  it("report problems by table row and column name instead of file line", () => {
    const csv = enteredSamplesToCsv([
      { t: "0", tempC: "20", phase: "heating" },
      { t: "ten", tempC: "90", phase: "disinfection" },
      { t: "20", tempC: "", phase: "disinfection" },
    ]);
    expect(issuesOf(csv)).toEqual([
      'Row 2, time (s): "ten" is not a number of seconds; write the elapsed time in seconds, e.g. 12 or 12.5',
      "Row 3, temperature (°C): the temperature is empty; every sample needs its temperature",
    ]);
  });

  it("name the earlier row when times repeat", () => {
    const csv = enteredSamplesToCsv([
      { t: "0", tempC: "20", phase: "" },
      { t: "30", tempC: "60", phase: "" },
      { t: "30", tempC: "70", phase: "" },
    ]);
    expect(issuesOf(csv)).toEqual(["Row 3, time (s): the time repeats row 2; each sample needs its own time, so remove the repeated row"]);
  });
});
