import { describe, expect, it } from "vitest";
import { bucketOf, bucketsBetween, localDateRange, localHourAt, weekStartOf } from "@/lib/reports/periods";

// Weeks and months in the unit's time zone. UK clock changes in 2026: forward at 01:00 UTC on
// Sunday 29 March, back at 01:00 UTC on Sunday 25 October (Summer Time Order 2002: from 01:00 GMT
// on the last Sunday of March to 01:00 GMT on the last Sunday of October).
const LONDON = "Europe/London";

describe("months in the unit's time zone", () => {
  it("puts 23:30 local on the last day of a month in that month, in winter and in summer", () => {
    expect(bucketOf("2026-10-31T23:30:00Z", "month", LONDON)).toBe("2026-10"); // GMT: 23:30 local
    expect(bucketOf("2026-09-30T22:30:00Z", "month", LONDON)).toBe("2026-09"); // BST: 23:30 local
  });

  it("puts 00:30 local on the first day in the new month, even while UTC still shows the old one", () => {
    expect(bucketOf("2026-09-30T23:30:00Z", "month", LONDON)).toBe("2026-10");
    expect(bucketOf("2026-12-31T23:59:59Z", "month", LONDON)).toBe("2026-12");
    expect(bucketOf("2027-01-01T00:00:00Z", "month", LONDON)).toBe("2027-01");
  });

  it("lists every month of a period, across a year end", () => {
    expect(bucketsBetween("2026-11-15", "2027-02-01", "month")).toEqual(["2026-11", "2026-12", "2027-01", "2027-02"]);
  });
});

describe("weeks from Monday in the unit's time zone", () => {
  it("starts a week on Monday 00:00 local", () => {
    expect(weekStartOf("2026-11-30")).toBe("2026-11-30"); // a Monday
    expect(weekStartOf("2026-12-06")).toBe("2026-11-30"); // the Sunday after
    expect(weekStartOf("2027-01-01")).toBe("2026-12-28");
  });

  it("keeps the Sunday of the autumn change in its week and the next Monday in the next", () => {
    // Sunday 25 Oct 23:30 GMT (the clocks went back that morning) → week from 19 Oct.
    expect(bucketOf("2026-10-25T23:30:00Z", "week", LONDON)).toBe("2026-10-19");
    // 00:30 on Sunday 25 Oct BST is 23:30 UTC on Saturday: the same week.
    expect(bucketOf("2026-10-24T23:30:00Z", "week", LONDON)).toBe("2026-10-19");
    expect(bucketOf("2026-10-26T00:30:00Z", "week", LONDON)).toBe("2026-10-26");
  });

  it("starts the week after the spring change at Monday 00:00 BST, 23:00 UTC on Sunday", () => {
    expect(bucketOf("2026-03-29T22:59:59Z", "week", LONDON)).toBe("2026-03-23");
    expect(bucketOf("2026-03-29T23:00:00Z", "week", LONDON)).toBe("2026-03-30");
  });

  it("gives the week of the change its real length: 167 hours in spring, 169 in autumn", () => {
    const spring = localDateRange("2026-03-23", "2026-03-29", LONDON);
    expect((Date.parse(spring.end) - Date.parse(spring.start)) / 3_600_000).toBe(167);
    const autumn = localDateRange("2026-10-19", "2026-10-25", LONDON);
    expect((Date.parse(autumn.end) - Date.parse(autumn.start)) / 3_600_000).toBe(169);
    expect(autumn).toEqual({ start: "2026-10-18T23:00:00.000Z", end: "2026-10-26T00:00:00.000Z" });
  });

  it("lists the Mondays of a period", () => {
    expect(bucketsBetween("2026-10-21", "2026-11-03", "week")).toEqual(["2026-10-19", "2026-10-26", "2026-11-02"]);
  });
});

describe("hours of day in the unit's time zone", () => {
  it("reads the local hour on either side of a change", () => {
    expect(localHourAt("2026-10-24T23:00:00Z", LONDON)).toBe(0); // BST
    expect(localHourAt("2026-10-25T23:00:00Z", LONDON)).toBe(23); // GMT
    expect(localHourAt("2026-03-29T00:30:00Z", LONDON)).toBe(0); // GMT, before the change
    expect(localHourAt("2026-03-29T01:30:00Z", LONDON)).toBe(2); // BST: 01:00–02:00 local never happened
  });
});
