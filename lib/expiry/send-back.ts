import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { contractTermsFor } from "@/lib/contracts/service";
import { CYCLE_STATE_LABELS, type CycleState } from "@/lib/cycles/lifecycle";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { toLocalDateTimeText } from "@/lib/local-time";
import { assessBooking } from "@/lib/orders/assess";
import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup } from "@/lib/orders/service";
import { parseOpeningHours } from "@/lib/sites/opening-hours";
import { formatLocalDate } from "./dates";
import { defaultPickupWindow } from "./window";

// "Send back for reprocessing": books a pickup of one delivered set through the normal booking
// path, with the site's next opening as the collection window and, as needed-back-by, the time
// the standard turnaround has it back. Anything the booking checks refuse is reported as is.

export interface SentBack {
  orderId: number;
  reference: string;
  serial: string;
  collectionFrom: string;
  collectionUntil: string;
}

const HOUR = 3_600_000;

export async function sendBackForReprocessing(db: Kysely<Database>, user: SessionUser, cycleId: number, now = new Date()): Promise<SentBack> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const cycle = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("sites", "sites.id", "cycles.site_id")
    .select([
      "cycles.id",
      "cycles.set_id",
      "cycles.state",
      "cycles.expires_on",
      "cycles.organisation_id",
      "cycles.site_id",
      "sets.serial",
      "sites.opening_hours",
      "sites.name as site_name",
    ])
    .where("cycles.id", "=", cycleId)
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .executeTakeFirst();
  if (!cycle) throw notFound("That set");
  const newer = await db
    .selectFrom("cycles")
    .select("state")
    .where("set_id", "=", cycle.set_id)
    .where("id", ">", cycle.id)
    .where("state", "!=", "cancelled")
    .orderBy("id", "desc")
    .executeTakeFirst();
  if (cycle.state !== "delivered" || newer) {
    const state = (newer?.state ?? cycle.state) as CycleState;
    throw new AppError("conflict", `${cycle.serial} is not waiting at ${cycle.site_name}: it is ${(CYCLE_STATE_LABELS[state] ?? state).toLowerCase()}.`);
  }

  const contract = await contractTermsFor(db, cycle.organisation_id, now, timeZone);
  const window = defaultPickupWindow({
    siteHours: parseOpeningHours(cycle.opening_hours),
    serviceCalendar: contract?.serviceCalendar ?? null,
    timeZone,
    now,
  });
  if (!window) {
    throw new AppError("validation", `${cycle.site_name} has no opening hours in the next two weeks, so no collection can be offered. Book the pickup by hand or ask the unit to check the site's hours.`);
  }
  const text = (at: Date) => toLocalDateTimeText(at, timeZone);
  const draft = bookingSchema.parse({
    siteId: cycle.site_id,
    setIds: [cycle.set_id],
    extras: [],
    collectionFrom: text(window.from),
    collectionUntil: text(window.until),
    neededBackBy: text(new Date(window.until.getTime() + 30 * 24 * HOUR)),
    serviceLevel: "standard",
    heavySoil: false,
    notes: cycle.expires_on
      ? `Sent back for reprocessing: its sterile pack ${cycle.expires_on < text(now).slice(0, 10) ? "expired" : "expires"} on ${formatLocalDate(cycle.expires_on)}.`
      : "Sent back for reprocessing.",
  });
  // The needed-back-by time: when the standard turnaround has it back, to the next whole hour.
  const preview = await assessBooking(db, user, draft, now);
  const booking = preview.plan
    ? { ...draft, neededBackBy: text(new Date(Math.ceil(preview.plan.earliestStandard.getTime() / HOUR) * HOUR)) }
    : draft;
  const { orderId, reference } = await bookPickup(db, user, booking, now);
  return { orderId, reference, serial: cycle.serial, collectionFrom: window.from.toISOString(), collectionUntil: window.until.toISOString() };
}
