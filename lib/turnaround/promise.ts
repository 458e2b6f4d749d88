import type { ServiceCalendar } from "./calendar";
import { addServiceTime } from "./clock";
import { assertDuration, assertValidDate, TurnaroundError } from "./errors";
import { MINUTE_MS } from "./local-time";

export type ServiceLevel = "standard" | "express";
export const SERVICE_LEVELS: readonly ServiceLevel[] = ["standard", "express"];

/** A contract's turnaround, in service hours of the unit's calendar, per service level. */
export type TurnaroundHours = Record<ServiceLevel, number>;

/**
 * Wall-clock minutes assumed between the end of a pickup's collection window and the sets being
 * received at the unit, when a booking is planned before anything has been collected.
 */
export const DEFAULT_TRANSIT_MINUTES = 60;

// The turnaround clock starts when the sets are received at the unit (the scan into "received"),
// not when they are booked or collected.

/** When the sets received at `receivedAt` are due back: `turnaroundHours` service hours later. */
export function promisedReturn(input: {
  calendar: ServiceCalendar;
  receivedAt: Date;
  turnaroundHours: number;
}): Date {
  assertValidDate(input.receivedAt, "receivedAt");
  assertDuration(input.turnaroundHours, "turnaroundHours", "hours", true);
  return addServiceTime(input.calendar, input.receivedAt, input.turnaroundHours * 60);
}

export interface PlanReturnInput {
  calendar: ServiceCalendar;
  /** The end of the booked collection window at the clinic. */
  collectionWindowEnd: Date;
  turnaroundHours: TurnaroundHours;
  /** When the clinic needs the sets back (the procedure they are for). */
  neededBackBy: Date;
  serviceLevel: ServiceLevel;
  /**
   * Wall-clock minutes from the end of the collection window to receipt at the unit
   * (default DEFAULT_TRANSIT_MINUTES, 60). Real minutes, not service minutes: the van drives
   * whether or not the unit is open.
   */
  transitMinutes?: number;
  /**
   * Wall-clock minutes from the end of the turnaround clock to the sets being back at the clinic
   * (default 0, for contracts whose clock runs until delivery). Give the return journey when the
   * contract stops the clock at release.
   */
  returnTransitMinutes?: number;
}

/** What the booking form can offer when the chosen level is not the best fit. */
export type ReturnSuggestion =
  /** The chosen level has the sets back in time; nothing to offer. */
  | { kind: "on_time"; message: string }
  /** Standard is chosen and late, express would be on time: offer express. */
  | { kind: "switch_to_express"; promisedAt: Date; message: string }
  /** Express is chosen but standard would also be on time: the express surcharge can be saved. */
  | { kind: "standard_is_enough"; promisedAt: Date; message: string }
  /** Neither level makes it: `earliestAt` is the soonest the sets can be back. */
  | { kind: "too_late"; earliestAt: Date; serviceLevel: ServiceLevel; message: string };

/**
 * A booking-time estimate, for planning only: the real clock starts on receipt, and whether a set
 * can be used for a procedure stays with the clinic's and the unit's own procedures.
 */
export interface ReturnPlan {
  /** Estimated receipt at the unit: collection window end plus the transit allowance. */
  estimatedReceivedAt: Date;
  /** When the sets are promised back at the chosen level. */
  promisedAt: Date;
  meetsNeededBy: boolean;
  /** When the sets would be back at each level. */
  earliestStandard: Date;
  earliestExpress: Date;
  suggestion: ReturnSuggestion;
}

// Plans a booking's return: estimated receipt, the promise at each level, and what to offer
// when the needed-back-by time is missed (or met more cheaply).
export function planReturn(input: PlanReturnInput): ReturnPlan {
  const { calendar, collectionWindowEnd, turnaroundHours, neededBackBy, serviceLevel } = input;
  const transitMinutes = input.transitMinutes ?? DEFAULT_TRANSIT_MINUTES;
  const returnTransitMinutes = input.returnTransitMinutes ?? 0;
  assertValidDate(collectionWindowEnd, "collectionWindowEnd");
  assertValidDate(neededBackBy, "neededBackBy");
  if (!SERVICE_LEVELS.includes(serviceLevel)) {
    throw new TurnaroundError("invalid_input", `serviceLevel must be "standard" or "express" (got ${String(serviceLevel)}).`, [
      { path: "serviceLevel", message: 'must be "standard" or "express"' },
    ]);
  }
  assertDuration(turnaroundHours?.standard, "turnaroundHours.standard", "hours", true);
  assertDuration(turnaroundHours?.express, "turnaroundHours.express", "hours", true);
  assertDuration(transitMinutes, "transitMinutes", "minutes");
  assertDuration(returnTransitMinutes, "returnTransitMinutes", "minutes");

  const estimatedReceivedAt = new Date(collectionWindowEnd.getTime() + Math.round(transitMinutes * MINUTE_MS));
  const backAt = (level: ServiceLevel) => {
    const due = promisedReturn({ calendar, receivedAt: estimatedReceivedAt, turnaroundHours: turnaroundHours[level] });
    return new Date(due.getTime() + Math.round(returnTransitMinutes * MINUTE_MS));
  };
  const earliestStandard = backAt("standard");
  const earliestExpress = backAt("express");
  const promisedAt = serviceLevel === "standard" ? earliestStandard : earliestExpress;
  const onTime = (at: Date) => at.getTime() <= neededBackBy.getTime();
  const meetsNeededBy = onTime(promisedAt);

  let suggestion: ReturnSuggestion;
  if (serviceLevel === "express" && onTime(earliestStandard)) {
    suggestion = {
      kind: "standard_is_enough",
      promisedAt: earliestStandard,
      message: "Standard turnaround also has the sets back in time.",
    };
  } else if (meetsNeededBy) {
    suggestion = { kind: "on_time", message: "The sets are due back before they are needed." };
  } else if (serviceLevel === "standard" && onTime(earliestExpress)) {
    suggestion = {
      kind: "switch_to_express",
      promisedAt: earliestExpress,
      message: "Standard turnaround is too late; express has the sets back in time.",
    };
  } else {
    const expressFirst = earliestExpress.getTime() <= earliestStandard.getTime();
    suggestion = {
      kind: "too_late",
      earliestAt: expressFirst ? earliestExpress : earliestStandard,
      serviceLevel: expressFirst ? "express" : "standard",
      message: "Neither service level has the sets back by the time they are needed.",
    };
  }
  return { estimatedReceivedAt, promisedAt, meetsNeededBy, earliestStandard, earliestExpress, suggestion };
}
