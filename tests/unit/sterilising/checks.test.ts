import { describe, expect, it } from "vitest";
import { assessRelease, type ReleaseCheckInput } from "@/lib/sterilising/checks";
import { capacityProblem, shelfFor } from "@/lib/sterilising/placement";

// The release checks and which of them block a release; capacity in StU and the shelf hint.

const base: ReleaseCheckInput = {
  requirement: { kind: "steam", name: "134 °C, 3 min", sterilisationTempC: 134, bandWidthK: 3, minHoldSeconds: 180, saturationToleranceK: 2, airRemoval: "prevacuum" },
  // F0 of 134 °C for 3 min is 58.495 min (computed, CHECKS.md); here a 4 min hold at 135 °C.
  figures: { f0: 98, band: { lowC: 134, highC: 137 }, holdSeconds: 240, plateauMinTempC: 134.8, plateauMaxTempC: 135.2, saturation: { deviationK: 0.2, measuredTempC: 135, saturationTempC: 134.8, pressureKpaAbs: 310 }, peakTempC: 135.2, durationSeconds: 1200 },
  recordPassed: true,
  recordReasons: [],
  airRemoval: { result: "pass", day: "2026-12-02" },
  unitDay: "2026-12-02",
  ci: { type: 4, result: "pass" },
  bi: { result: "not_used", required: false },
  containsImplant: false,
  earlyRelease: null,
};

describe("assessRelease", () => {
  it("passes a load whose checks all meet their limits", () => {
    const a = assessRelease(base);
    expect(a.blockers).toEqual([]);
    expect(a.checks.map((c) => [c.key, c.status])).toEqual([
      ["hold", "pass"],
      ["band", "pass"],
      ["f0", "pass"],
      ["saturation", "pass"],
      ["air_removal", "pass"],
      ["ci", "pass"],
      ["bi", "not_required"],
    ]);
  });
  it("blocks without the day's air-removal test, and after a failed one", () => {
    expect(assessRelease({ ...base, airRemoval: null }).blockers.join(" ")).toMatch(/no passed air-removal test on 2026-12-02/);
    expect(assessRelease({ ...base, airRemoval: { result: "fail", day: "2026-12-02" } }).blockers.join(" ")).toMatch(/failed/);
  });
  it("blocks an implant load until the BI is read, unless an early release is documented (CDC 2008: a BI in every implant load)", () => {
    const implant = { ...base, containsImplant: true, bi: { result: "pending" as const, required: true } };
    expect(assessRelease(implant).blockers.join(" ")).toMatch(/holds implants/);
    const early = assessRelease({ ...implant, earlyRelease: { reason: "Emergency case" } });
    expect(early.blockers).toEqual([]);
    expect(early.checks.find((c) => c.key === "bi")!.status).toBe("waived");
    expect(assessRelease({ ...implant, bi: { result: "pass", required: true } }).blockers).toEqual([]);
    expect(assessRelease({ ...implant, bi: { result: "fail", required: true } }).blockers.join(" ")).toMatch(/growth/);
  });
  it("blocks a failed record and a chemical indicator that did not change", () => {
    expect(assessRelease({ ...base, recordPassed: false, recordReasons: ["Too short."] }).blockers.join(" ")).toMatch(/Too short/);
    expect(assessRelease({ ...base, ci: { type: 4, result: "fail" } }).blockers.join(" ")).toMatch(/chemical indicator/);
    expect(assessRelease({ ...base, figures: null }).checks.every((c) => !["hold", "band", "f0"].includes(c.key) || c.status === "missing")).toBe(true);
  });
  it("marks a hold below the program's minimum as failed", () => {
    const short = assessRelease({ ...base, figures: { ...base.figures!, holdSeconds: 170 } });
    expect(short.checks.find((c) => c.key === "hold")!.status).toBe("fail");
  });
});

describe("chamber capacity and placement", () => {
  it("counts whole StU of the chamber (EN 285: 1 StU = 300 × 300 × 600 mm)", () => {
    expect(capacityProblem({ machineCode: "S1", capacityStu: 6, loadStu: 5.5, addStu: 0.5, serial: "X", loadNumber: "L" })).toBeNull();
    expect(capacityProblem({ machineCode: "S1", capacityStu: 6, loadStu: 5.5, addStu: 1, serial: "X", loadNumber: "L" })).toMatch(/holds 6 StU/);
    expect(capacityProblem({ machineCode: "S1", capacityStu: null, loadStu: 50, addStu: 1, serial: "X", loadNumber: "L" })).toBeNull();
  });
  it("puts sets at or above the threshold on the lower shelf (common practice)", () => {
    expect(shelfFor(7000, 7000)).toBe("lower");
    expect(shelfFor(6999, 7000)).toBe("any");
  });
});
