import { describe, expect, it } from "vitest";
import { serviceCalendarSchema, WEEKDAYS } from "@/lib/turnaround";
import { weekdaysEightToSix } from "./fixtures";

// Issues of a calendar that fails validation, as "path: message".
function problems(input: unknown): string[] {
  const result = serviceCalendarSchema.safeParse(input);
  if (result.success) return [];
  return result.error.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`);
}

const withMonday = (mon: unknown) => ({ ...weekdaysEightToSix(), hours: { ...weekdaysEightToSix().hours, mon } });

describe("serviceCalendarSchema", () => {
  it("accepts working calendars, touching intervals, 24:00 ends and unsorted intervals", () => {
    expect(problems(weekdaysEightToSix(["2026-12-25"]))).toEqual([]);
    expect(
      problems(
        withMonday([
          { start: "13:00", end: "24:00" },
          { start: "00:00", end: "13:00" },
        ]),
      ),
    ).toEqual([]);
  });

  it("rejects overlapping intervals and names both", () => {
    expect(
      problems(
        withMonday([
          { start: "08:00", end: "12:00" },
          { start: "11:30", end: "14:00" },
        ]),
      ),
    ).toEqual(["hours.mon.1: mon intervals 08:00–12:00 and 11:30–14:00 overlap; merge them or move one"]);
  });

  it("rejects an end before or at its start, and explains midnight", () => {
    const [issue] = problems(withMonday([{ start: "22:00", end: "06:00" }]));
    expect(issue).toMatch(/^hours\.mon\.0\.end: end 06:00 must be after start 22:00/);
    expect(issue).toContain("one ending at 24:00 and one starting at 00:00 the next day");
    expect(problems(withMonday([{ start: "09:00", end: "09:00" }]))).toHaveLength(1);
  });

  it("rejects time text that is not HH:MM", () => {
    expect(problems(withMonday([{ start: "8:00", end: "18:00" }]))).toEqual([
      'hours.mon.0.start: start "8:00" must be a time of day written HH:MM, from 00:00 to 23:59',
    ]);
    expect(problems(withMonday([{ start: "08:00", end: "24:30" }]))).toEqual([
      'hours.mon.0.end: end "24:30" must be a time of day written HH:MM, from 00:01 to 24:00',
    ]);
    expect(problems(withMonday([{ start: "24:00", end: "24:00" }]))[0]).toMatch(/^hours\.mon\.0\.start: start "24:00"/);
    expect(problems(withMonday([{ start: "08:60", end: "18:00" }]))).toHaveLength(1);
    expect(problems(withMonday([{ start: 800, end: "18:00" }]))).toEqual([
      "hours.mon.0.start: start must be a time of day written HH:MM",
    ]);
  });

  it("rejects holidays that are not calendar dates", () => {
    expect(problems({ ...weekdaysEightToSix(), holidays: ["2026-02-30", "25/12/2026", "2026-12-25"] })).toEqual([
      'holidays.0: holiday "2026-02-30" is not a calendar date written YYYY-MM-DD',
      'holidays.1: holiday "25/12/2026" is not a calendar date written YYYY-MM-DD',
    ]);
    expect(problems({ ...weekdaysEightToSix(), holidays: "2026-12-25" })).toEqual([
      'holidays: holidays must be a list of local dates written YYYY-MM-DD (e.g. "2026-12-25")',
    ]);
  });

  it("rejects an unknown time zone", () => {
    expect(problems({ ...weekdaysEightToSix(), timeZone: "Europe/Larkmoor" })).toEqual([
      'timeZone: timeZone "Europe/Larkmoor" is not a time zone this system knows; use an IANA name such as "Europe/London"',
    ]);
  });

  it("rejects a missing weekday and an unknown key", () => {
    const { sun: _sun, ...sixDays } = weekdaysEightToSix().hours;
    expect(problems({ ...weekdaysEightToSix(), hours: sixDays })).toEqual([
      "hours.sun: hours.sun must be a list of {start, end} intervals (an empty list means closed)",
    ]);
    expect(problems({ ...weekdaysEightToSix(), hours: { ...weekdaysEightToSix().hours, monday: [] } })).toEqual([
      'hours: hours has unknown weekday "monday"; the weekdays are mon, tue, wed, thu, fri, sat, sun',
    ]);
    expect(problems({ ...weekdaysEightToSix(), zone: "Europe/London" })).toEqual([
      ': a service calendar has only timeZone, hours and holidays, not "zone"',
    ]);
  });

  it("rejects a calendar that is never open", () => {
    const closed = Object.fromEntries(WEEKDAYS.map((day) => [day, []]));
    expect(problems({ timeZone: "Europe/London", hours: closed, holidays: [] })).toEqual([
      "hours: the calendar has no working hours on any weekday; give at least one interval",
    ]);
  });

  it("rejects something that is not a calendar at all", () => {
    expect(problems(null)).toEqual([": a service calendar must be an object with timeZone, hours and holidays"]);
  });
});
