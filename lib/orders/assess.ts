import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { SET_CLASS_LABELS, type SetClass } from "@/lib/catalogue/vocabulary";
import { type ContractTermsInForce, contractTermsFor } from "@/lib/contracts/service";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { formatDateTime, weekdayKey } from "@/lib/format";
import { parseLocalDateTime } from "@/lib/local-time";
import { formatDayHours, parseOpeningHours, WEEKDAY_LABELS } from "@/lib/sites/opening-hours";
import { planReturn, type ReturnPlan, serviceMinutesBetween } from "@/lib/turnaround";
import type { BookingFields } from "./schemas";

// Everything a booking must satisfy, checked in one place for the live preview and the final
// booking alike: the site, the window against its opening hours, each set, the contract, and
// whether the needed-back-by time can be met.

export interface BookingProblem {
  field: string;
  message: string;
}

export interface BookedSetView {
  id: number;
  serial: string;
  name: string;
  setClass: string;
  loaner: boolean;
}

export interface BookingQuote {
  currency: string;
  /** Estimated processing fees at the first band price of each set's class. */
  processingMinor: number;
  expressSurchargeMinor: number;
  heavySoilSurchargeMinor: number;
  outOfHoursSurchargeMinor: number;
  loanerSurchargeMinor: number;
}

export interface BookingAssessment {
  problems: BookingProblem[];
  site: { id: number; organisationId: number; name: string } | null;
  sets: BookedSetView[];
  contract: ContractTermsInForce | null;
  window: { from: Date; until: Date } | null;
  neededBackBy: Date | null;
  plan: ReturnPlan | null;
  outOfHours: boolean;
  quote: BookingQuote | null;
}

/** Grace for a window that starts "now" while the form is being filled in. */
const PAST_GRACE_MS = 5 * 60_000;
const MAX_WINDOW_HOURS = 12;

export async function assessBooking(
  db: Kysely<Database>,
  user: SessionUser,
  input: BookingFields,
  now: Date,
  options: { ignoreOrderId?: number } = {},
): Promise<BookingAssessment> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const problems: BookingProblem[] = [];
  const result: BookingAssessment = {
    problems,
    site: null,
    sets: [],
    contract: null,
    window: null,
    neededBackBy: null,
    plan: null,
    outOfHours: false,
    quote: null,
  };

  const site = await db
    .selectFrom("sites")
    .innerJoin("organisations", "organisations.id", "sites.organisation_id")
    .select(["sites.id", "sites.organisation_id", "sites.name", "sites.opening_hours", "sites.active", "organisations.kind"])
    .where("sites.id", "=", input.siteId)
    .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }))
    .executeTakeFirst();
  if (!site || site.kind !== "customer") {
    problems.push({ field: "siteId", message: "Choose one of your organisation's sites." });
    return result;
  }
  if (!site.active) problems.push({ field: "siteId", message: `${site.name} is switched off; ask the unit to switch it on.` });
  result.site = { id: site.id, organisationId: site.organisation_id, name: site.name };

  // The window: real times, in the future, inside the site's opening hours.
  const from = parseLocalDateTime(input.collectionFrom, timeZone);
  const until = parseLocalDateTime(input.collectionUntil, timeZone);
  const neededBackBy = parseLocalDateTime(input.neededBackBy, timeZone);
  if (!from) problems.push({ field: "collectionFrom", message: "That is not a real date and time." });
  if (!until) problems.push({ field: "collectionUntil", message: "That is not a real date and time." });
  if (!neededBackBy) problems.push({ field: "neededBackBy", message: "That is not a real date and time." });
  if (from && until) {
    if (until <= from) problems.push({ field: "collectionUntil", message: "The latest collection time must be after the earliest." });
    else if (until.getTime() - from.getTime() > MAX_WINDOW_HOURS * 3600_000) {
      problems.push({ field: "collectionUntil", message: `Keep the collection window within ${MAX_WINDOW_HOURS} hours.` });
    } else if (from.getTime() < now.getTime() - PAST_GRACE_MS) {
      problems.push({ field: "collectionFrom", message: "The collection window has already started or passed; choose a later time." });
    } else {
      result.window = { from, until };
      const hours = parseOpeningHours(site.opening_hours);
      const siteCalendar = { timeZone, hours, holidays: [] };
      const open = Object.values(hours).some((day) => day.length > 0);
      const openMinutes = open ? serviceMinutesBetween(siteCalendar, from, until) : 0;
      const windowMinutes = (until.getTime() - from.getTime()) / 60_000;
      if (openMinutes + 0.01 < windowMinutes) {
        const day = weekdayKey(from, timeZone);
        problems.push({
          field: "collectionFrom",
          message: `The collection window must lie inside ${site.name}'s opening hours (${WEEKDAY_LABELS[day]}: ${formatDayHours(hours[day])}).`,
        });
      }
    }
  }
  if (neededBackBy && until && neededBackBy <= until) {
    problems.push({ field: "neededBackBy", message: "Sets cannot be back before they are collected; choose a later time." });
  }

  // The sets: the organisation's own, at this site, in service, not already on their way.
  if (input.setIds.length > 0) {
    const rows = await db
      .selectFrom("sets")
      .innerJoin("set_types", "set_types.id", "sets.set_type_id")
      .innerJoin("sites", "sites.id", "sets.home_site_id")
      .select([
        "sets.id",
        "sets.serial",
        "sets.status",
        "sets.home_site_id",
        "sites.name as home_site_name",
        "set_types.name",
        "set_types.set_class",
        "set_types.ifu_file_id",
        (eb) =>
          eb
            .selectFrom("cycles")
            .select("cycles.state")
            .whereRef("cycles.set_id", "=", "sets.id")
            .where("cycles.state", "not in", ["delivered", "cancelled"])
            .where("cycles.order_id", "is distinct from", options.ignoreOrderId ?? null)
            .limit(1)
            .as("open_state"),
      ])
      .where("sets.id", "in", input.setIds)
      .where("sets.organisation_id", "=", site.organisation_id)
      .execute();
    const byId = new Map(rows.map((r) => [r.id, r]));
    for (const id of input.setIds) {
      const row = byId.get(id);
      if (!row) {
        problems.push({ field: "setIds", message: `Set #${id} is not one of your organisation's sets.` });
        continue;
      }
      if (row.home_site_id !== site.id) {
        problems.push({ field: "setIds", message: `${row.serial} belongs to ${row.home_site_name}; book it from that site.` });
      } else if (row.status !== "in_service") {
        problems.push({ field: "setIds", message: `${row.serial} is retired and cannot be booked.` });
      } else if (row.open_state) {
        problems.push({ field: "setIds", message: `${row.serial} is already booked or at the unit; it can be booked again once it is back.` });
      } else if (row.set_class === "loaner_set" && !row.ifu_file_id) {
        problems.push({
          field: "setIds",
          message: `${row.serial} (${row.name}) is a loaner set without instructions for use on file; ask the unit to file its IFU before booking it.`,
        });
      }
      result.sets.push({ id: row.id, serial: row.serial, name: row.name, setClass: row.set_class, loaner: row.set_class === "loaner_set" });
    }
  }

  // The contract in force decides the turnaround, the calendar and the prices.
  const contract = await contractTermsFor(db, site.organisation_id, now, timeZone);
  if (!contract) {
    problems.push({ field: "", message: "Your organisation has no contract in force today; contact the unit before booking." });
    return result;
  }
  result.contract = contract;
  if (result.window) {
    const windowMinutes = (result.window.until.getTime() - result.window.from.getTime()) / 60_000;
    result.outOfHours = serviceMinutesBetween(contract.serviceCalendar, result.window.from, result.window.until) + 0.01 < windowMinutes;
  }
  for (const set of result.sets) {
    if (!contract.rateCard.classes.some((c) => c.setClass === set.setClass)) {
      const label = SET_CLASS_LABELS[set.setClass as SetClass] ?? set.setClass;
      problems.push({ field: "setIds", message: `Your contract has no price for ${label} (${set.serial}); ask the unit to add one.` });
    }
  }
  if (result.window && neededBackBy && neededBackBy > result.window.until) {
    result.neededBackBy = neededBackBy;
    const plan = planReturn({
      calendar: contract.serviceCalendar,
      collectionWindowEnd: result.window.until,
      turnaroundHours: contract.turnaroundHours,
      neededBackBy,
      serviceLevel: input.serviceLevel,
    });
    result.plan = plan;
    if (!plan.meetsNeededBy) {
      const suggestion = plan.suggestion;
      const alternative =
        suggestion.kind === "switch_to_express"
          ? ` Choose express: it has them back by ${formatDateTime(suggestion.promisedAt, timeZone)}.`
          : suggestion.kind === "too_late"
            ? ` The earliest they can be back is ${formatDateTime(suggestion.earliestAt, timeZone)} (${suggestion.serviceLevel}); choose that time or later, or an earlier collection.`
            : "";
      problems.push({
        field: "neededBackBy",
        message: `At ${input.serviceLevel} turnaround the sets are due back ${formatDateTime(plan.promisedAt, timeZone)}, after you need them.${alternative}`,
      });
    }
  }
  result.quote = quoteFor(contract, result.sets, input, result.outOfHours);
  return result;
}

/** A price estimate from the contract's rate card: first band price per set, plus surcharges. */
function quoteFor(contract: ContractTermsInForce, sets: BookedSetView[], input: BookingFields, outOfHours: boolean): BookingQuote {
  const fee = (setClass: string) => contract.rateCard.classes.find((c) => c.setClass === setClass)?.bands[0]?.unitPriceMinor ?? 0;
  const surcharge = (kind: string, applies: (s: BookedSetView) => boolean) => {
    const rule = contract.rateCard.surcharges.find((r) => r.kind === kind);
    if (!rule) return 0;
    return sets
      .filter(applies)
      .reduce((sum, s) => sum + (rule.basis === "per_set" ? rule.amountMinor : Math.round((fee(s.setClass) * rule.basisPoints) / 10_000)), 0);
  };
  return {
    currency: contract.currency,
    processingMinor: sets.reduce((sum, s) => sum + fee(s.setClass), 0),
    expressSurchargeMinor: surcharge("express", () => true),
    heavySoilSurchargeMinor: input.heavySoil ? surcharge("heavy_soil", () => true) : 0,
    outOfHoursSurchargeMinor: outOfHours ? surcharge("out_of_hours", () => true) : 0,
    loanerSurchargeMinor: surcharge("loaner", (s) => s.loaner),
  };
}
