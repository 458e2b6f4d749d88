import { describe, expect, it } from "vitest";
import { AppError } from "@/lib/errors";
import { decodeSignature } from "@/lib/runs/service";
import { codeMatchesSet, completeStopSchema, localDay, minutesText, notServedText, stopScanSchema } from "@/lib/runs/shared";

// The small rules of the run sheet: which code names which set, the words of a stop not served,
// times of the plan day, and what the phone may send.

const SET = { serial: "QMH-000004", giai: "952123400000004" };
const ID = "6f1c7a0e-3b7e-4d55-9a8e-0d0f4b1f2c3a";

describe("matching a scanned code to a set on the list", () => {
  it("knows the set by its serial (with or without the dash, any case), its GIAI, or a GS1 string carrying the GIAI (AI 8004)", () => {
    expect(codeMatchesSet("QMH-000004", SET)).toBe(true);
    expect(codeMatchesSet(" qmh000004 ", SET)).toBe(true);
    expect(codeMatchesSet("952123400000004", SET)).toBe(true);
    expect(codeMatchesSet("8004952123400000004", SET)).toBe(true);
    expect(codeMatchesSet("(8004)952123400000004", SET)).toBe(true);
  });

  it("does not take another set's code, or nothing, for this one", () => {
    expect(codeMatchesSet("QMH-000005", SET)).toBe(false);
    expect(codeMatchesSet("8004952123400000005", SET)).toBe(false);
    expect(codeMatchesSet("", SET)).toBe(false);
  });
});

describe("a stop's words and times", () => {
  it("stores the reason with the driver's note when there is one", () => {
    expect(notServedText("closed")).toBe("Site closed");
    expect(notServedText("other", "  Gate code changed  ")).toBe("Other: Gate code changed");
  });

  it("shows minutes from the plan day's midnight as HH:MM", () => {
    expect(minutesText(0)).toBe("00:00");
    expect(minutesText(8 * 60 + 5)).toBe("08:05");
    expect(minutesText(599.6)).toBe("10:00");
    expect(minutesText(null)).toBeNull();
  });

  it("keys the plan by the local date in the unit's zone, not the UTC date", () => {
    // 23:30 UTC on 30 June is 00:30 on 1 July in London (BST, UTC+1).
    expect(localDay(new Date("2026-06-30T23:30:00Z"), "Europe/London")).toBe("2026-07-01");
    expect(localDay(new Date("2026-12-01T23:30:00Z"), "Europe/London")).toBe("2026-12-01");
  });
});

describe("what the phone may send", () => {
  it("needs a client-made id and a code or a tapped set", () => {
    expect(stopScanSchema.safeParse({ clientEventId: ID, code: "QMH-000004" }).success).toBe(true);
    expect(stopScanSchema.safeParse({ clientEventId: ID, cycleId: 12 }).success).toBe(true);
    expect(stopScanSchema.safeParse({ clientEventId: ID }).success).toBe(false);
    expect(stopScanSchema.safeParse({ clientEventId: "12", code: "QMH-000004" }).success).toBe(false);
  });

  it("needs the receiver's name and signature to sign off, and a note when the reason is other", () => {
    expect(completeStopSchema.safeParse({ clientEventId: ID, outcome: "served", receiverName: "A", signature: "x" }).success).toBe(false);
    expect(completeStopSchema.safeParse({ clientEventId: ID, outcome: "served", receiverName: "Ada Quill", signature: "" }).success).toBe(false);
    expect(completeStopSchema.safeParse({ clientEventId: ID, outcome: "not_served", reason: "access" }).success).toBe(true);
    const other = completeStopSchema.safeParse({ clientEventId: ID, outcome: "not_served", reason: "other" });
    expect(other.success).toBe(false);
    expect(other.error!.issues[0]!.path).toEqual(["note"]);
  });
});

describe("reading the signature the phone sends", () => {
  it("decodes a data URL or bare base64 into the image bytes", () => {
    const png = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(Buffer.from(decodeSignature(`data:image/png;base64,${png.toString("base64")}`))).toEqual(png);
    expect(Buffer.from(decodeSignature(png.toString("base64")))).toEqual(png);
  });

  it("refuses text that is not base64 with a message saying what to do", () => {
    expect(() => decodeSignature("not an image!")).toThrowError(AppError);
    expect(() => decodeSignature("not an image!")).toThrowError(/sign again/);
  });
});
