import { describe, expect, it } from "vitest";
import {
  A0_CLASS_OPTIONS,
  describeRequirement,
  formatDuration,
  parseRequirement,
  requirementMismatch,
  TIME_TEMP_PRESET,
  washerRequirementOf,
} from "@/lib/machines/requirements";
import { programSchema } from "@/lib/machines/schemas";

describe("program requirements", () => {
  it("offer the A0 classes with their sources", () => {
    // A0 60 for containers for human waste (EN ISO 15883-3); A0 600 and A0 3000 (EN ISO 15883-1).
    expect(A0_CLASS_OPTIONS.map((c) => [c.minA0, c.source])).toEqual([
      [60, "EN ISO 15883-3"],
      [600, "EN ISO 15883-1"],
      [3000, "EN ISO 15883-1"],
    ]);
    // 90 °C held for at least 1 minute (common practice).
    expect(TIME_TEMP_PRESET).toMatchObject({ minTempC: 90, minHoldSeconds: 60 });
  });

  it("read stored JSON defensively and in words", () => {
    expect(describeRequirement(parseRequirement('{"kind":"a0","minA0":3000}'))).toBe("A0 ≥ 3000 (EN ISO 15883-1)");
    expect(describeRequirement(parseRequirement('{"kind":"a0","minA0":1200,"minTempC":90}'))).toBe("A0 ≥ 1200, reaching 90 °C");
    expect(describeRequirement(parseRequirement('{"kind":"time_temp","minTempC":90,"minHoldSeconds":300}'))).toBe("90 °C held for 5 min");
    expect(describeRequirement(parseRequirement('{"kind":"set_point","tempC":60,"seconds":1800}'))).toBe("60 °C for 30 min");
    expect(parseRequirement("not json")).toBeNull();
    expect(parseRequirement('{"kind":"a0","minA0":-5}')).toBeNull();
    expect(describeRequirement(null)).toBe("Requirement not readable");
    expect(washerRequirementOf('{"kind":"set_point","tempC":180}')).toBeNull();
  });

  it("fit only the machine kind they belong to", () => {
    expect(requirementMismatch("washer", { kind: "a0", minA0: 600 })).toBeNull();
    expect(requirementMismatch("heat_sealer", { kind: "a0", minA0: 600 })).toBe("A heat sealer program needs a set point.");
  });

  it("turn the form's minutes into seconds", () => {
    const parsed = programSchema.parse({
      machineId: "3",
      code: "cont-90-5",
      name: "Containers",
      active: true,
      requirementKind: "time_temp",
      minTempC: "90",
      holdMinutes: "3,5",
    });
    expect(parsed).toEqual({ machineId: 3, code: "CONT-90-5", name: "Containers", active: true, requirement: { kind: "time_temp", minTempC: 90, minHoldSeconds: 210 } });
    expect(formatDuration(210)).toBe("3 min 30 s");
    expect(formatDuration(3600 + 60)).toBe("1 h 1 min");
  });
});
