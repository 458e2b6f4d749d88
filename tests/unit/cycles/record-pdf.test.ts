import { describe, expect, it } from "vitest";
import { type CycleRecordSheet, pdfText, renderCycleRecordPdf } from "@/lib/cycles/record-pdf";
import type { CycleSample } from "@/lib/cycles/record";

// The one-page cycle record drawn from plain data: always a single A4 page, whatever the length
// of the load list or the record.

function sheet(overrides: Partial<CycleRecordSheet> = {}): CycleRecordSheet {
  const samples: CycleSample[] = Array.from({ length: 900 }, (_, i) => {
    const t = i * 2;
    const tempC = t < 600 ? 20 + (t / 600) * 114.5 : t < 840 ? 134.5 : 134.5 - ((t - 840) / 960) * 60;
    return { t, tempC, pressureKpaAbs: t < 600 ? 100 + (t / 600) * 210 : t < 840 ? 310 : 310 - ((t - 840) / 960) * 220 };
  });
  return {
    what: "Steriliser load",
    number: "S1-261202-04",
    unitName: "Larkmoor Sterile Services",
    machine: { code: "S1", name: "Steam steriliser 1" },
    program: { code: "P134", name: "134 °C 3.5 min prevac", requirementText: "Pre-vacuum, 134–137 °C for 3 min 30 s" },
    facts: [
      { label: "Started", value: "2 Dec 2026, 07:40 by a technician" },
      { label: "Ended", value: "2 Dec 2026, 08:35" },
    ],
    items: Array.from({ length: 150 }, (_, i) => ({ serial: `SET-${String(i).padStart(4, "0")}`, description: "Minor set", customer: "A customer" })),
    checks: [
      { label: "Held in the band", computed: "4 min", required: "≥ 3 min 30 s", ok: true },
      { label: "F0", computed: "58.5", required: "for information", ok: null },
    ],
    decision: { outcome: "Released", by: "The quality lead", at: "2 Dec 2026, 09:00", reasons: [] },
    curve: { samples, band: { lowC: 134, highC: 137 }, hold: { fromT: 600, toT: 840 }, figures: [{ label: "F0", value: "58.5 min" }] },
    advisory: "Advisory only.",
    printedAt: "2 Dec 2026, 09:10",
    ...overrides,
  };
}

describe("the one-page cycle record", () => {
  it("renders one A4 page with a long load list and a pressure curve", async () => {
    const pdf = await renderCycleRecordPdf(sheet());
    expect(pdf.subarray(0, 5).toString("latin1")).toBe("%PDF-");
    const text = pdf.toString("latin1");
    expect(text).toMatch(/\/Type \/Pages\s*\/Count 1\b/);
    expect(text).toContain("/MediaBox [0 0 595.28 841.89]");
  });

  it("renders without a curve and without sets", async () => {
    const pdf = await renderCycleRecordPdf(sheet({ curve: null, curveMissing: "No record yet.", items: [], checks: [] }));
    expect(pdf.toString("latin1")).toMatch(/\/Count 1\b/);
  });

  it("spells out signs the standard font cannot print", () => {
    expect(pdfText("A0 ≥ 600, −2 °C, 3 → 4, ✓")).toBe("A0 >= 600, -2 °C, 3 -> 4, yes");
    expect(pdfText("134–137 °C · µS/cm")).toBe("134–137 °C · µS/cm");
    expect(pdfText("a\u2603b")).toBe("ab");
  });
});
