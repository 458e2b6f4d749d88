import { describe, expect, it } from "vitest";
import { isoWeekKey, weeklyPeriod } from "@/lib/jobs/schedule";

// The weekly job's period: the ISO week of its slot (Monday 07:00, Europe/London).

describe("ISO 8601 week keys", () => {
  // The worked examples of the Wikipedia article "ISO week date" (section "Examples"), quoted
  // from memory and cross-checked against Python's date.isocalendar().
  it.each([
    ["2005-01-01", "2004-W53"],
    ["2005-01-02", "2004-W53"],
    ["2005-12-31", "2005-W52"],
    ["2007-01-01", "2007-W01"],
    ["2007-12-30", "2007-W52"],
    ["2007-12-31", "2008-W01"],
    ["2008-01-01", "2008-W01"],
    ["2008-12-28", "2008-W52"],
    ["2008-12-29", "2009-W01"],
    ["2009-12-31", "2009-W53"],
    ["2010-01-03", "2009-W53"],
  ])("%s is in %s", (date, key) => {
    expect(isoWeekKey(date)).toBe(key);
  });

  it("keys sort in time order across a year end", () => {
    const keys = ["2026-12-21", "2026-12-28", "2027-01-04", "2027-01-11"].map(isoWeekKey);
    // 2026 starts on a Thursday, so it has 53 ISO weeks (ISO 8601 rule: a year has week 53 when
    // it starts on a Thursday, or on a Wednesday in a leap year).
    expect(keys).toEqual(["2026-W52", "2026-W53", "2027-W01", "2027-W02"]);
    expect([...keys].sort()).toEqual(keys);
  });
});

describe("the weekly slot, Monday 07:00 in Europe/London", () => {
  const period = (iso: string) => {
    const p = weeklyPeriod(new Date(iso), "Europe/London", 1, "07:00");
    return { key: p.key, at: p.scheduledAt.toISOString() };
  };

  it("is this week's Monday once 07:00 has passed, last week's before", () => {
    // Tuesday 1 December 2026 (GMT, so local time is UTC).
    expect(period("2026-12-01T10:00:00Z")).toEqual({ key: "2026-W49", at: "2026-11-30T07:00:00.000Z" });
    expect(period("2026-11-30T07:00:00Z")).toEqual({ key: "2026-W49", at: "2026-11-30T07:00:00.000Z" });
    expect(period("2026-11-30T06:59:59Z")).toEqual({ key: "2026-W48", at: "2026-11-23T07:00:00.000Z" });
    // Sunday evening still belongs to the week that began on Monday.
    expect(period("2026-12-06T23:30:00Z")).toEqual({ key: "2026-W49", at: "2026-11-30T07:00:00.000Z" });
  });

  it("follows the local clock across daylight-saving changes", () => {
    // UK summer time runs from 01:00 UTC on the last Sunday of March to 01:00 UTC on the last
    // Sunday of October (the Summer Time Order 2002 and EU directive 2000/84/EC, from memory): in 2026, 29 March and
    // 25 October. 07:00 BST is 06:00 UTC; 07:00 GMT is 07:00 UTC.
    expect(period("2026-10-19T06:00:00Z")).toEqual({ key: "2026-W43", at: "2026-10-19T06:00:00.000Z" });
    expect(period("2026-10-19T05:59:00Z").key).toBe("2026-W42");
    expect(period("2026-10-26T07:00:00Z")).toEqual({ key: "2026-W44", at: "2026-10-26T07:00:00.000Z" });
    expect(period("2026-10-26T06:30:00Z").key).toBe("2026-W43");
    expect(period("2026-03-23T07:00:00Z")).toEqual({ key: "2026-W13", at: "2026-03-23T07:00:00.000Z" });
    expect(period("2026-03-30T06:00:00Z")).toEqual({ key: "2026-W14", at: "2026-03-30T06:00:00.000Z" });
  });

  it("names the week of the slot across a year end", () => {
    expect(period("2027-01-03T20:00:00Z")).toEqual({ key: "2026-W53", at: "2026-12-28T07:00:00.000Z" });
    expect(period("2027-01-04T07:00:00Z")).toEqual({ key: "2027-W01", at: "2027-01-04T07:00:00.000Z" });
  });

  it("works for other weekdays and times, and refuses nonsense", () => {
    // Friday 17:30 on Tuesday 1 December 2026: the last one was Friday 27 November, week 48.
    const friday = weeklyPeriod(new Date("2026-12-01T10:00:00Z"), "Europe/London", 5, "17:30");
    expect(friday).toEqual({ key: "2026-W48", scheduledAt: new Date("2026-11-27T17:30:00Z") });
    expect(() => weeklyPeriod(new Date(), "Europe/London", 0)).toThrow(RangeError);
    expect(() => weeklyPeriod(new Date(), "Europe/London", 1, "7am")).toThrow(RangeError);
  });
});
