import { describe, expect, it } from "vitest";
import { dueState, localDate } from "@/lib/monitoring/schedule";

const LONDON = "Europe/London";
const at = (iso: string) => new Date(iso);

describe("when a recurring check is due", () => {
  it("keeps a daily check done today as done, due the next local day and overdue the day after", () => {
    const done = at("2026-12-01T07:30:00Z");
    expect(dueState(done, 1, at("2026-12-01T22:00:00Z"), LONDON)).toEqual({ status: "done", dueOn: "2026-12-02", daysLate: 0 });
    expect(dueState(done, 1, at("2026-12-02T23:59:00Z"), LONDON)).toEqual({ status: "due", dueOn: "2026-12-02", daysLate: 0 });
    expect(dueState(done, 1, at("2026-12-03T00:00:00Z"), LONDON)).toEqual({ status: "overdue", dueOn: "2026-12-02", daysLate: 1 });
    expect(dueState(done, 1, at("2026-12-06T12:00:00Z"), LONDON).daysLate).toBe(4);
  });

  it("counts days on the unit's calendar, not in UTC, across summer time", () => {
    // 23:30 UTC on 1 June is 00:30 on 2 June in London (BST, UTC+1): done on 2 June.
    const lateEvening = at("2026-06-01T23:30:00Z");
    expect(localDate(lateEvening, LONDON)).toBe("2026-06-02");
    expect(dueState(lateEvening, 1, at("2026-06-02T12:00:00Z"), LONDON).status).toBe("done");
    // The same instant in UTC is still 1 June: due on 2 June already.
    expect(dueState(lateEvening, 1, at("2026-06-02T12:00:00Z"), "UTC").status).toBe("due");
    // In winter London is on UTC: 23:30 UTC is 23:30 the same day.
    expect(localDate(at("2026-12-01T23:30:00Z"), LONDON)).toBe("2026-12-01");
  });

  it("counts a weekly check from the day it was done, whatever the hour", () => {
    const monday = at("2026-11-30T16:45:00Z");
    expect(dueState(monday, 7, at("2026-12-06T20:00:00Z"), LONDON).status).toBe("done");
    expect(dueState(monday, 7, at("2026-12-07T06:00:00Z"), LONDON)).toEqual({ status: "due", dueOn: "2026-12-07", daysLate: 0 });
    expect(dueState(monday, 7, at("2026-12-08T00:05:00Z"), LONDON)).toEqual({ status: "overdue", dueOn: "2026-12-07", daysLate: 1 });
  });

  it("spans the autumn clock change: a day of 25 hours is still one day", () => {
    // London leaves summer time at 01:00 UTC on 25 October 2026.
    const saturday = at("2026-10-24T22:30:00Z"); // 23:30 BST on 24 October
    expect(dueState(saturday, 1, at("2026-10-25T23:30:00Z"), LONDON).status).toBe("due"); // 23:30 GMT on 25 October
    expect(dueState(saturday, 1, at("2026-10-26T00:00:00Z"), LONDON).status).toBe("overdue");
  });

  it("counts a never-done check from its baseline, and as overdue without one", () => {
    const added = at("2026-12-01T10:00:00Z");
    expect(dueState(null, 7, at("2026-12-03T10:00:00Z"), LONDON, added).status).toBe("done");
    expect(dueState(null, 1, at("2026-12-03T10:00:00Z"), LONDON)).toEqual({ status: "overdue", dueOn: null, daysLate: 0 });
  });

  it("refuses an interval that is not a whole number of days", () => {
    expect(() => dueState(null, 0, new Date(), LONDON)).toThrow(RangeError);
    expect(() => dueState(null, 1.5, new Date(), LONDON)).toThrow(RangeError);
  });
});
