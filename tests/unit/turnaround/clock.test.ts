import { TZDate, tzScan } from "@date-fns/tz";
import { describe, expect, it } from "vitest";
import {
  addServiceTime,
  isOpen,
  nextOpening,
  serviceMinutesBetween,
  TurnaroundError,
  type ServiceCalendar,
} from "@/lib/turnaround";
import { allWeek, at, weekdaysAllDay, weekdaysEightToSix, withSundayNight } from "./fixtures";

const HOUR = 60;

describe("addServiceTime on a Monday–Friday calendar", () => {
  // CHECKS.md, "Turnaround and logistics" (common practice): received Friday 16:00 with 24 service
  // hours of a Mon–Fri calendar → due Monday 16:00. Working days are whole days 00:00–24:00.
  it("takes a Friday 16:00 receipt with 24 service hours to Monday 16:00 (winter, GMT)", () => {
    // Friday 6 November 2026 16:00 GMT = 16:00 UTC.
    const due = addServiceTime(weekdaysAllDay(), at("2026-11-06T16:00:00Z"), 24 * HOUR);
    expect(due.toISOString()).toBe("2026-11-09T16:00:00.000Z");
  });

  it("takes a Friday 16:00 receipt with 24 service hours to Monday 16:00 (summer, BST)", () => {
    // Same check value; Friday 10 July 2026 16:00 BST = 15:00 UTC, Monday 13 July 16:00 BST = 15:00 UTC.
    const due = addServiceTime(weekdaysAllDay(), at("2026-07-10T15:00:00Z"), 24 * HOUR);
    expect(due.toISOString()).toBe("2026-07-13T15:00:00.000Z");
    expect(new TZDate(due.getTime(), "Europe/London").getHours()).toBe(16);
  });

  // Worked by hand, Mon–Fri 08:00–18:00, received Thursday 11 June 2026 15:00 BST, 24 service hours:
  //   Thu 15:00–18:00   3 h  (21 h left)
  //   Fri 08:00–18:00  10 h  (11 h left)
  //   Sat, Sun closed
  //   Mon 08:00–18:00  10 h  ( 1 h left)
  //   Tue 08:00–09:00   1 h  → due Tuesday 16 June 2026 09:00 BST = 08:00 UTC.
  it("counts only working hours of an 08:00–18:00 calendar (worked by hand)", () => {
    const received = at("2026-06-11T14:00:00Z");
    const due = addServiceTime(weekdaysEightToSix(), received, 24 * HOUR);
    expect(due.toISOString()).toBe("2026-06-16T08:00:00.000Z");
    expect(serviceMinutesBetween(weekdaysEightToSix(), received, due)).toBe(24 * HOUR);
  });

  it("ends at a closing time when the hours run out exactly then, not at the next opening", () => {
    // Thursday 11 June 2026 17:00 BST plus 60 min → 18:00 BST the same day (17:00 UTC).
    const due = addServiceTime(weekdaysEightToSix(), at("2026-06-11T16:00:00Z"), 60);
    expect(due.toISOString()).toBe("2026-06-11T17:00:00.000Z");
  });
});

describe("a start outside working hours", () => {
  const calendar = weekdaysEightToSix();

  it("starts the clock at the next opening", () => {
    // Saturday 13 June 2026 10:00 BST, 5 service hours → Monday 15 June 08:00 + 5 h = 13:00 BST.
    const due = addServiceTime(calendar, at("2026-06-13T09:00:00Z"), 5 * HOUR);
    expect(due.toISOString()).toBe("2026-06-15T12:00:00.000Z");
    // Same as starting at Monday's opening.
    expect(addServiceTime(calendar, at("2026-06-15T07:00:00Z"), 5 * HOUR)).toEqual(due);
  });

  it("gives the next opening for 0 minutes, and the start itself when open", () => {
    // Tuesday 16 June 2026 06:00 BST → 08:00 BST; at 18:00 BST (closing) → Wednesday 08:00 BST.
    expect(addServiceTime(calendar, at("2026-06-16T05:00:00Z"), 0).toISOString()).toBe("2026-06-16T07:00:00.000Z");
    expect(addServiceTime(calendar, at("2026-06-16T17:00:00Z"), 0).toISOString()).toBe("2026-06-17T07:00:00.000Z");
    expect(addServiceTime(calendar, at("2026-06-16T10:00:00Z"), 0).toISOString()).toBe("2026-06-16T10:00:00.000Z");
  });

  it("measures no service time while closed", () => {
    // Friday 18:00 BST to Monday 08:00 BST.
    expect(serviceMinutesBetween(calendar, at("2026-06-12T17:00:00Z"), at("2026-06-15T07:00:00Z"))).toBe(0);
  });
});

describe("isOpen and nextOpening", () => {
  const calendar = weekdaysEightToSix();

  it("treats opening as open and closing as closed", () => {
    expect(isOpen(calendar, at("2026-06-16T07:00:00Z"))).toBe(true); // Tue 08:00 BST
    expect(isOpen(calendar, at("2026-06-16T06:59:59.999Z"))).toBe(false);
    expect(isOpen(calendar, at("2026-06-16T16:59:59.999Z"))).toBe(true);
    expect(isOpen(calendar, at("2026-06-16T17:00:00Z"))).toBe(false); // Tue 18:00 BST
    expect(isOpen(calendar, at("2026-06-13T10:00:00Z"))).toBe(false); // Saturday
  });

  it("finds the next opening across a weekend", () => {
    // Friday 12 June 2026 19:00 BST → Monday 15 June 08:00 BST.
    expect(nextOpening(calendar, at("2026-06-12T18:00:00Z")).toISOString()).toBe("2026-06-15T07:00:00.000Z");
    expect(nextOpening(calendar, at("2026-06-12T09:30:00Z")).toISOString()).toBe("2026-06-12T09:30:00.000Z");
  });

  it("moves on from one interval to the next on the same day", () => {
    const split: ServiceCalendar = {
      ...calendar,
      hours: { ...calendar.hours, wed: [{ start: "13:00", end: "17:00" }, { start: "07:00", end: "12:00" }] },
    };
    // Wednesday 17 June 2026 12:30 BST (lunch) → 13:00 BST; 2 h from 11:00 BST → 1 h before, 1 h after.
    expect(isOpen(split, at("2026-06-17T11:30:00Z"))).toBe(false);
    expect(nextOpening(split, at("2026-06-17T11:30:00Z")).toISOString()).toBe("2026-06-17T12:00:00.000Z");
    expect(addServiceTime(split, at("2026-06-17T10:00:00Z"), 2 * HOUR).toISOString()).toBe("2026-06-17T13:00:00.000Z");
  });
});

describe("public holidays", () => {
  // UK bank holidays (England and Wales) from memory: Christmas Day Friday 25 December 2026 and,
  // Boxing Day being a Saturday, the substitute day Monday 28 December 2026.
  const holidays = ["2026-12-25", "2026-12-28"];

  it("skips a holiday and its neighbouring weekend (express, 5 service hours)", () => {
    // Thu 24 Dec 16:00 GMT: Thu 16:00–18:00 2 h, Fri 25 holiday, weekend, Mon 28 holiday,
    // Tue 29 08:00–11:00 3 h → Tuesday 29 December 11:00 GMT.
    const due = addServiceTime(weekdaysEightToSix(holidays), at("2026-12-24T16:00:00Z"), 5 * HOUR);
    expect(due.toISOString()).toBe("2026-12-29T11:00:00.000Z");
    // Without the holidays the same job is done on Christmas Day 11:00.
    expect(addServiceTime(weekdaysEightToSix(), at("2026-12-24T16:00:00Z"), 5 * HOUR).toISOString()).toBe(
      "2026-12-25T11:00:00.000Z",
    );
  });

  it("skips both holidays for a standard 24-hour turnaround", () => {
    // Thu 24 Dec 2 h (22 left), Tue 29 10 h (12 left), Wed 30 10 h (2 left), Thu 31 08:00–10:00.
    const due = addServiceTime(weekdaysEightToSix(holidays), at("2026-12-24T16:00:00Z"), 24 * HOUR);
    expect(due.toISOString()).toBe("2026-12-31T10:00:00.000Z");
  });

  it("skips whole weeks when holidays fall on the only working weekday", () => {
    // Open Mondays 08:00–18:00 only; Mondays 7, 14 and 21 December 2026 made holidays for the test.
    // Friday 4 December + 1 h → Monday 28 December 09:00 GMT.
    const mondays: ServiceCalendar = {
      timeZone: "Europe/London",
      hours: { mon: [{ start: "08:00", end: "18:00" }], tue: [], wed: [], thu: [], fri: [], sat: [], sun: [] },
      holidays: ["2026-12-07", "2026-12-14", "2026-12-21"],
    };
    expect(addServiceTime(mondays, at("2026-12-04T12:00:00Z"), 60).toISOString()).toBe("2026-12-28T09:00:00.000Z");
  });

  it("is closed all day on a holiday and counts nothing there", () => {
    const calendar = weekdaysAllDay(holidays);
    expect(isOpen(calendar, at("2026-12-25T12:00:00Z"))).toBe(false);
    expect(serviceMinutesBetween(calendar, at("2026-12-25T00:00:00Z"), at("2026-12-26T00:00:00Z"))).toBe(0);
    // CHECKS.md example across the holidays: Thu 24 Dec 16:00 + 24 h → Tue 29 Dec 16:00.
    expect(addServiceTime(calendar, at("2026-12-24T16:00:00Z"), 24 * HOUR).toISOString()).toBe(
      "2026-12-29T16:00:00.000Z",
    );
  });
});

describe("daylight-saving changes in Europe/London, 2026", () => {
  it("has the changes on 29 March and 25 October 2026 at 01:00 UTC", () => {
    // UK rule (last Sunday of March and of October, 01:00 UTC), from memory; confirmed here against
    // the runtime's time zone data through @date-fns/tz.
    const changes = tzScan("Europe/London", { start: at("2026-01-01T00:00:00Z"), end: at("2027-01-01T00:00:00Z") });
    expect(changes.map((c) => ({ date: c.date.toISOString(), change: c.change }))).toEqual([
      { date: "2026-03-29T01:00:00.000Z", change: 60 },
      { date: "2026-10-25T01:00:00.000Z", change: -60 },
    ]);
  });

  describe("a 24/7 calendar counts real hours", () => {
    const calendar = allWeek();

    it("adds 24 real hours across spring-forward, not 23 local ones", () => {
      // Saturday 28 March 12:00 GMT + 24 h = Sunday 29 March 12:00 UTC, which the wall shows as 13:00 BST.
      const due = addServiceTime(calendar, at("2026-03-28T12:00:00Z"), 24 * HOUR);
      expect(due.toISOString()).toBe("2026-03-29T12:00:00.000Z");
      expect(new TZDate(due.getTime(), "Europe/London").getHours()).toBe(13);
    });

    it("adds 24 real hours across fall-back, not 25 local ones", () => {
      // Saturday 24 October 12:00 BST (11:00 UTC) + 24 h = Sunday 25 October 11:00 UTC = 11:00 GMT.
      const due = addServiceTime(calendar, at("2026-10-24T11:00:00Z"), 24 * HOUR);
      expect(due.toISOString()).toBe("2026-10-25T11:00:00.000Z");
      expect(new TZDate(due.getTime(), "Europe/London").getHours()).toBe(11);
    });

    it("measures the short and the long Sunday", () => {
      const midnight = (y: number, m: number, d: number) => new TZDate(y, m - 1, d, "Europe/London");
      expect(serviceMinutesBetween(calendar, midnight(2026, 3, 29), midnight(2026, 3, 30))).toBe(23 * HOUR);
      expect(serviceMinutesBetween(calendar, midnight(2026, 10, 25), midnight(2026, 10, 26))).toBe(25 * HOUR);
    });
  });

  describe("a calendar open on Sunday night", () => {
    const night = withSundayNight([{ start: "00:30", end: "03:00" }]);

    it("makes 00:30–03:00 shorter on the spring-forward Sunday", () => {
      // 00:30 GMT = 00:30 UTC to 03:00 BST = 02:00 UTC: 1 h 30 min.
      expect(serviceMinutesBetween(night, at("2026-03-28T12:00:00Z"), at("2026-03-29T12:00:00Z"))).toBe(90);
      // 60 min from the opening: 01:30 UTC, which the wall shows as 02:30 BST.
      expect(addServiceTime(night, at("2026-03-29T00:30:00Z"), 60).toISOString()).toBe("2026-03-29T01:30:00.000Z");
      // 90 min from Saturday are used up at the 03:00 BST closing; 91 spill into Monday 08:01 BST.
      expect(addServiceTime(night, at("2026-03-28T12:00:00Z"), 90).toISOString()).toBe("2026-03-29T02:00:00.000Z");
      expect(addServiceTime(night, at("2026-03-28T12:00:00Z"), 91).toISOString()).toBe("2026-03-30T07:01:00.000Z");
    });

    it("makes 00:30–03:00 longer on the fall-back Sunday", () => {
      // 00:30 BST = 23:30 UTC on Saturday to 03:00 GMT = 03:00 UTC: 3 h 30 min.
      expect(serviceMinutesBetween(night, at("2026-10-24T12:00:00Z"), at("2026-10-25T12:00:00Z"))).toBe(210);
      expect(nextOpening(night, at("2026-10-24T12:00:00Z")).toISOString()).toBe("2026-10-24T23:30:00.000Z");
      expect(addServiceTime(night, at("2026-10-24T12:00:00Z"), 210).toISOString()).toBe("2026-10-25T03:00:00.000Z");
    });

    it("opens at the clock change when the opening time is skipped", () => {
      // 01:30 does not exist on 29 March: the wall jumps from 01:00 GMT to 02:00 BST at 01:00 UTC,
      // so 01:30–03:00 runs from 01:00 UTC to 02:00 UTC.
      const skipped = withSundayNight([{ start: "01:30", end: "03:00" }]);
      expect(isOpen(skipped, at("2026-03-29T00:59:59.999Z"))).toBe(false);
      expect(isOpen(skipped, at("2026-03-29T01:00:00Z"))).toBe(true);
      expect(nextOpening(skipped, at("2026-03-29T00:00:00Z")).toISOString()).toBe("2026-03-29T01:00:00.000Z");
      expect(serviceMinutesBetween(skipped, at("2026-03-29T00:00:00Z"), at("2026-03-29T12:00:00Z"))).toBe(60);
    });

    it("opens at the first of two 01:30s after fall-back", () => {
      // 01:30 happens at 00:30 UTC (BST) and again at 01:30 UTC (GMT); the first counts.
      const repeated = withSundayNight([{ start: "01:30", end: "03:00" }]);
      expect(nextOpening(repeated, at("2026-10-25T00:00:00Z")).toISOString()).toBe("2026-10-25T00:30:00.000Z");
      expect(serviceMinutesBetween(repeated, at("2026-10-25T00:00:00Z"), at("2026-10-25T12:00:00Z"))).toBe(150);
    });

    it("has nothing to count when a whole interval is skipped", () => {
      // 01:10–01:50 on 29 March never shows on the wall; the clock goes straight to Monday.
      const gone = withSundayNight([{ start: "01:10", end: "01:50" }]);
      expect(serviceMinutesBetween(gone, at("2026-03-28T12:00:00Z"), at("2026-03-30T00:00:00Z"))).toBe(0);
      expect(nextOpening(gone, at("2026-03-28T12:00:00Z")).toISOString()).toBe("2026-03-30T07:00:00.000Z");
      // A week later the same hours are 40 min long (BST all night).
      expect(serviceMinutesBetween(gone, at("2026-04-04T12:00:00Z"), at("2026-04-05T12:00:00Z"))).toBe(40);
    });
  });
});

describe("calendar changes", () => {
  it("follows a calendar object that was changed after it was first used", () => {
    const calendar = weekdaysEightToSix();
    // Tuesday 16 June 2026 12:00 BST.
    expect(isOpen(calendar, at("2026-06-16T11:00:00Z"))).toBe(true);
    calendar.holidays.push("2026-06-16");
    expect(isOpen(calendar, at("2026-06-16T11:00:00Z"))).toBe(false);
  });
});

describe("bad input", () => {
  it("rejects negative, infinite and non-numeric minutes", () => {
    for (const minutes of [-1, Number.NaN, Number.POSITIVE_INFINITY, "60" as unknown as number]) {
      expect(() => addServiceTime(weekdaysAllDay(), at("2026-06-15T08:00:00Z"), minutes)).toThrow(TurnaroundError);
    }
    expect(() => addServiceTime(weekdaysAllDay(), at("2026-06-15T08:00:00Z"), -5)).toThrow(
      /minutes must be a number of minutes, 0 or more \(got -5\)/,
    );
  });

  it("rejects invalid dates by name", () => {
    expect(() => serviceMinutesBetween(weekdaysAllDay(), at("2026-06-15T08:00:00Z"), new Date("soon"))).toThrow(
      /to must be a valid Date/,
    );
    expect(() => isOpen(weekdaysAllDay(), new Date(Number.NaN))).toThrow(TurnaroundError);
  });

  it("answers 0 when to is not after from", () => {
    const t = at("2026-06-15T10:00:00Z");
    expect(serviceMinutesBetween(weekdaysAllDay(), t, t)).toBe(0);
    expect(serviceMinutesBetween(weekdaysAllDay(), t, at("2026-06-14T10:00:00Z"))).toBe(0);
  });

  it("refuses an invalid calendar with every issue listed", () => {
    const broken = {
      ...weekdaysEightToSix(),
      hours: { ...weekdaysEightToSix().hours, mon: [{ start: "18:00", end: "08:00" }] },
      holidays: ["2026-13-01"],
    };
    try {
      addServiceTime(broken, at("2026-06-15T08:00:00Z"), 60);
      expect.unreachable("an invalid calendar must throw");
    } catch (error) {
      expect(error).toBeInstanceOf(TurnaroundError);
      const e = error as TurnaroundError;
      expect(e.code).toBe("invalid_calendar");
      expect(e.issues.map((i) => i.path)).toEqual(["hours.mon.0.end", "holidays.0"]);
      expect(e.message).toContain("end 08:00 must be after start 18:00");
    }
  });
});
