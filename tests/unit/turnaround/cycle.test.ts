import { describe, expect, it } from "vitest";
import { cycleTurnaround } from "@/lib/turnaround";
import type { ServiceCalendar } from "@/lib/turnaround";

// Monday–Friday, whole days: the calendar of the common-practice example (received Friday 16:00
// with 24 service hours → due Monday 16:00).
const weekdays: ServiceCalendar = {
  timeZone: "Europe/London",
  hours: {
    mon: [{ start: "00:00", end: "24:00" }],
    tue: [{ start: "00:00", end: "24:00" }],
    wed: [{ start: "00:00", end: "24:00" }],
    thu: [{ start: "00:00", end: "24:00" }],
    fri: [{ start: "00:00", end: "24:00" }],
    sat: [],
    sun: [],
  },
  holidays: [],
};
const terms = (clockStopsAt: "released" | "delivered") => ({ serviceCalendar: weekdays, turnaroundHours: { standard: 24, express: 5 }, clockStopsAt });

describe("a cycle's turnaround under its contract", () => {
  // Friday 4 December 2026 16:00 GMT; due Monday 7 December 16:00 (common practice, CHECKS.md).
  const receivedAt = "2026-12-04T16:00:00.000Z";

  it("stops the clock at release or at delivery, as the contract says", () => {
    const cycle = { serviceLevel: "standard" as const, receivedAt, releasedAt: "2026-12-07T15:00:00.000Z", deliveredAt: "2026-12-07T17:30:00.000Z" };
    expect(cycleTurnaround(cycle, terms("released"))).toMatchObject({ late: false, dueAt: new Date("2026-12-07T16:00:00.000Z") });
    expect(cycleTurnaround(cycle, terms("delivered"))).toMatchObject({ late: true, lateByMinutes: 90 });
  });

  it("uses the cycle's own service level", () => {
    const express = { serviceLevel: "express" as const, receivedAt, releasedAt: "2026-12-07T04:00:00.000Z", deliveredAt: null };
    // 5 service hours from Friday 16:00: 8 h remain on Friday, so due Friday 21:00 — released Monday is late.
    expect(cycleTurnaround(express, terms("released"))).toMatchObject({ late: true, dueAt: new Date("2026-12-04T21:00:00.000Z") });
  });

  it("has no outcome while the clock still runs", () => {
    expect(cycleTurnaround({ serviceLevel: "standard", receivedAt: null, releasedAt: null, deliveredAt: null }, terms("released"))).toBeNull();
    expect(cycleTurnaround({ serviceLevel: "standard", receivedAt, releasedAt: "2026-12-07T15:00:00.000Z", deliveredAt: null }, terms("delivered"))).toBeNull();
  });
});
