import { describe, expect, it } from "vitest";
import { manualWashSteps, unconfirmedSteps } from "@/lib/washing/checklist";

describe("the manual wash checklist", () => {
  it("asks every set to be brushed and rinsed, and only where the type says so dismantled and its lumens flushed", () => {
    expect(manualWashSteps([])).toEqual(["brushed", "rinsed"]);
    expect(manualWashSteps(["manual_wash_only", "dismantle"])).toEqual(["dismantled", "brushed", "rinsed"]);
    expect(manualWashSteps(["lumens_to_flush", "dismantle", "ultrasonic"])).toEqual(["dismantled", "brushed", "rinsed", "lumensFlushed"]);
  });

  it("lists what is not yet confirmed; a step the type does not need is not asked for", () => {
    expect(unconfirmedSteps(["lumens_to_flush"], { brushed: true, rinsed: false })).toEqual(["rinsed", "lumensFlushed"]);
    expect(unconfirmedSteps([], { brushed: true, rinsed: true })).toEqual([]);
    expect(unconfirmedSteps([], { brushed: true, rinsed: true, dismantled: false })).toEqual([]);
  });
});
