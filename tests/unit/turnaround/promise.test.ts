import { describe, expect, it } from "vitest";
import {
  DEFAULT_TRANSIT_MINUTES,
  isLate,
  planReturn,
  promisedReturn,
  TurnaroundError,
  turnaroundOutcome,
} from "@/lib/turnaround";
import { at, weekdaysAllDay, weekdaysEightToSix } from "./fixtures";

// Standard 24 h and express 5 h: CHECKS.md "Turnaround and logistics" (common practice; published
// NHS contract figures).
const turnaroundHours = { standard: 24, express: 5 };
const calendar = weekdaysEightToSix();

describe("promisedReturn", () => {
  it("counts the turnaround from receipt at the unit", () => {
    // CHECKS.md (common practice): Friday 16:00 + 24 service hours of Mon–Fri → Monday 16:00.
    const due = promisedReturn({ calendar: weekdaysAllDay(), receivedAt: at("2026-11-06T16:00:00Z"), turnaroundHours: 24 });
    expect(due.toISOString()).toBe("2026-11-09T16:00:00.000Z");
  });

  it("gives express sooner than standard", () => {
    // Mon–Fri 08:00–18:00, received Monday 15 June 2026 10:00 BST.
    //   express 5 h → Monday 15:00 BST;
    //   standard 24 h → Mon 10:00–18:00 8 h, Tue 10 h, Wed 08:00–14:00 6 h → Wednesday 14:00 BST.
    const receivedAt = at("2026-06-15T09:00:00Z");
    expect(promisedReturn({ calendar, receivedAt, turnaroundHours: 5 }).toISOString()).toBe("2026-06-15T14:00:00.000Z");
    expect(promisedReturn({ calendar, receivedAt, turnaroundHours: 24 }).toISOString()).toBe("2026-06-17T13:00:00.000Z");
  });

  it("refuses a turnaround of 0 or less", () => {
    expect(() => promisedReturn({ calendar, receivedAt: at("2026-06-15T09:00:00Z"), turnaroundHours: 0 })).toThrow(
      /turnaroundHours must be a number of hours above 0/,
    );
  });
});

describe("planReturn", () => {
  // Collection window ends Monday 15 June 2026 09:00 BST; with the default 60 min transit the sets
  // are received at 10:00 BST, which gives the express and standard times worked out above.
  const base = { calendar, collectionWindowEnd: at("2026-06-15T08:00:00Z"), turnaroundHours };

  it("estimates receipt as the window end plus 60 wall-clock minutes by default", () => {
    expect(DEFAULT_TRANSIT_MINUTES).toBe(60);
    const plan = planReturn({ ...base, neededBackBy: at("2026-06-18T08:00:00Z"), serviceLevel: "standard" });
    expect(plan.estimatedReceivedAt.toISOString()).toBe("2026-06-15T09:00:00.000Z");
    expect(plan.earliestExpress.toISOString()).toBe("2026-06-15T14:00:00.000Z");
    expect(plan.earliestStandard.toISOString()).toBe("2026-06-17T13:00:00.000Z");
  });

  it("is on time when the chosen level makes it", () => {
    // Needed Thursday 18 June 09:00 BST; standard is back Wednesday 14:00 BST.
    const plan = planReturn({ ...base, neededBackBy: at("2026-06-18T08:00:00Z"), serviceLevel: "standard" });
    expect(plan.promisedAt).toEqual(plan.earliestStandard);
    expect(plan.meetsNeededBy).toBe(true);
    expect(plan.suggestion.kind).toBe("on_time");
  });

  it("counts a promise exactly at the needed time as on time", () => {
    const plan = planReturn({ ...base, neededBackBy: at("2026-06-17T13:00:00Z"), serviceLevel: "standard" });
    expect(plan.meetsNeededBy).toBe(true);
  });

  it("offers express when standard is too late and express is not", () => {
    // Needed Wednesday 17 June 12:00 BST: standard (Wed 14:00) misses it, express (Mon 15:00) makes it.
    const plan = planReturn({ ...base, neededBackBy: at("2026-06-17T11:00:00Z"), serviceLevel: "standard" });
    expect(plan.meetsNeededBy).toBe(false);
    expect(plan.promisedAt.toISOString()).toBe("2026-06-17T13:00:00.000Z");
    expect(plan.suggestion).toMatchObject({ kind: "switch_to_express", promisedAt: at("2026-06-15T14:00:00Z") });
  });

  it("says when neither level makes it and gives the earliest time", () => {
    // Needed Monday 15 June 12:00 BST: even express (Mon 15:00 BST) is three hours late.
    for (const serviceLevel of ["standard", "express"] as const) {
      const plan = planReturn({ ...base, neededBackBy: at("2026-06-15T11:00:00Z"), serviceLevel });
      expect(plan.meetsNeededBy).toBe(false);
      expect(plan.suggestion).toMatchObject({
        kind: "too_late",
        earliestAt: at("2026-06-15T14:00:00Z"),
        serviceLevel: "express",
      });
    }
  });

  it("points out when express is chosen but standard would do", () => {
    const plan = planReturn({ ...base, neededBackBy: at("2026-06-18T08:00:00Z"), serviceLevel: "express" });
    expect(plan.meetsNeededBy).toBe(true);
    expect(plan.promisedAt).toEqual(plan.earliestExpress);
    expect(plan.suggestion).toMatchObject({ kind: "standard_is_enough", promisedAt: at("2026-06-17T13:00:00Z") });
  });

  it("starts the clock at the next opening when the van arrives after closing", () => {
    // Window ends Friday 19 June 17:30 BST, 60 min transit → 18:30 BST, after closing:
    // express runs Monday 22 June 08:00–13:00 BST.
    const plan = planReturn({
      ...base,
      collectionWindowEnd: at("2026-06-19T16:30:00Z"),
      neededBackBy: at("2026-06-22T12:00:00Z"),
      serviceLevel: "express",
    });
    expect(plan.estimatedReceivedAt.toISOString()).toBe("2026-06-19T17:30:00.000Z");
    expect(plan.earliestExpress.toISOString()).toBe("2026-06-22T12:00:00.000Z");
    expect(plan.meetsNeededBy).toBe(true);
  });

  it("uses the given transit allowances", () => {
    // 30 min in: received 09:30 BST, express back 14:30 BST; plus 45 min back to the clinic, 15:15 BST.
    const plan = planReturn({
      ...base,
      neededBackBy: at("2026-06-15T14:15:00Z"),
      serviceLevel: "express",
      transitMinutes: 30,
      returnTransitMinutes: 45,
    });
    expect(plan.estimatedReceivedAt.toISOString()).toBe("2026-06-15T08:30:00.000Z");
    expect(plan.earliestExpress.toISOString()).toBe("2026-06-15T14:15:00.000Z");
    expect(plan.meetsNeededBy).toBe(true);
  });

  it("names the field at fault", () => {
    const needed = at("2026-06-18T08:00:00Z");
    const fieldOf = (run: () => unknown) => {
      try {
        run();
      } catch (error) {
        expect(error).toBeInstanceOf(TurnaroundError);
        return (error as TurnaroundError).issues[0]?.path;
      }
      return "no error";
    };
    expect(fieldOf(() => planReturn({ ...base, neededBackBy: new Date("x"), serviceLevel: "standard" }))).toBe("neededBackBy");
    expect(
      fieldOf(() => planReturn({ ...base, neededBackBy: needed, serviceLevel: "overnight" as "standard" })),
    ).toBe("serviceLevel");
    expect(
      fieldOf(() =>
        planReturn({ ...base, turnaroundHours: { standard: 24, express: -1 }, neededBackBy: needed, serviceLevel: "standard" }),
      ),
    ).toBe("turnaroundHours.express");
    expect(
      fieldOf(() => planReturn({ ...base, neededBackBy: needed, serviceLevel: "standard", transitMinutes: -10 })),
    ).toBe("transitMinutes");
  });
});

describe("turnaroundOutcome and isLate", () => {
  // Received Friday 6 November 2026 16:00 GMT, 24 service hours Mon–Fri → due Monday 9 November
  // 16:00 GMT (CHECKS.md, common practice).
  const input = { calendar: weekdaysAllDay(), startedAt: at("2026-11-06T16:00:00Z"), turnaroundHours: 24 };

  it("is on time when finished exactly at the due time", () => {
    const outcome = turnaroundOutcome({ ...input, finishedAt: at("2026-11-09T16:00:00Z") });
    expect(outcome).toEqual({ dueAt: at("2026-11-09T16:00:00Z"), late: false, lateByMinutes: 0, lateByServiceMinutes: 0 });
    expect(isLate({ ...input, finishedAt: at("2026-11-09T16:00:00Z") })).toBe(false);
  });

  it("is late a millisecond after the due time, by one whole minute", () => {
    const outcome = turnaroundOutcome({ ...input, finishedAt: at("2026-11-09T16:00:00.001Z") });
    expect(outcome).toMatchObject({ late: true, lateByMinutes: 1, lateByServiceMinutes: 1 });
  });

  it("gives real and service minutes late", () => {
    // Due Monday 16:00; finished Monday 17:30 → 90 min late by either measure.
    expect(turnaroundOutcome({ ...input, finishedAt: at("2026-11-09T17:30:00Z") })).toMatchObject({
      late: true,
      lateByMinutes: 90,
      lateByServiceMinutes: 90,
    });
    // Mon–Fri 08:00–18:00, started Friday 6 November 2026 16:00 GMT with 2 h: due Friday 18:00 GMT.
    // Finished Saturday 10:00 GMT: 16 h late on the wall, no service time late.
    const short = { calendar, startedAt: at("2026-11-06T16:00:00Z"), turnaroundHours: 2 };
    expect(turnaroundOutcome({ ...short, finishedAt: at("2026-11-07T10:00:00Z") })).toEqual({
      dueAt: at("2026-11-06T18:00:00Z"),
      late: true,
      lateByMinutes: 16 * 60,
      lateByServiceMinutes: 0,
    });
  });

  it("refuses a finish before the start", () => {
    expect(() => isLate({ ...input, finishedAt: at("2026-11-06T15:00:00Z") })).toThrow(/finishedAt .* is before startedAt/);
  });
});
