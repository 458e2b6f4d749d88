import { describe, expect, it } from "vitest";
import { batchNumberPrefix, nextBatchNumber } from "@/lib/washing/numbering";

describe("washer batch numbers", () => {
  it("take the washer's code and the month in the unit's time zone", () => {
    expect(batchNumberPrefix("W3", new Date("2026-12-15T10:00:00Z"), "Europe/London")).toBe("W3-2612");
    // 23:30 UTC on 31 May is already 1 June in London (BST, UTC+1).
    expect(batchNumberPrefix("W1", new Date("2026-05-31T23:30:00Z"), "Europe/London")).toBe("W1-2606");
    expect(batchNumberPrefix("W1", new Date("2026-05-31T23:30:00Z"), "UTC")).toBe("W1-2605");
  });

  it("count on from the highest number of the same washer and month", () => {
    expect(nextBatchNumber("W3-2612", [])).toBe("W3-2612-0001");
    expect(nextBatchNumber("W3-2612", ["W3-2612-0041", "W3-2612-0007"])).toBe("W3-2612-0042");
    // Other washers, other months and a code that merely starts alike do not count.
    expect(nextBatchNumber("W3-2612", ["W3-2611-0090", "W30-2612-0005", "W3-2612-0002"])).toBe("W3-2612-0003");
    expect(nextBatchNumber("W1-2612", ["W1-2612-9999"])).toBe("W1-2612-10000");
  });
});
