import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { assertCan } from "@/lib/auth/permissions";
import { CUSTOMER_ROLES } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { formatDate } from "@/lib/format";
import { expectedVisitMail, visitWithdrawnMail } from "@/lib/mail/dispatch-templates";
import { enqueueMail } from "@/lib/mail/outbox";
import { clockText, planClock } from "./stops";

// Publishing a day's plan: the drivers' runs become their run sheets, and every customer site
// with a stop is told the van's expected time, once; a later publish tells a site again only
// when its time moved, and tells it when a visit it was told about is no longer on any run.
//
// Decisions:
// - The time sent is the planned start of service rounded to 5 minutes, with a half-hour range
//   around it; "changed" means that rounded time changed.
// - Recipients are the site's contacts: the customer's active users at that site and the site's
//   contact address; when the site has neither, the organisation's users for every site. The
//   notice is operational (someone must be at the door), so it ignores the mail preferences.

type Db = Kysely<Database> | Transaction<Database>;

export const EXPECTED_TIME_STEP_MIN = 5;
const RANGE_MIN = 15;

/** The rounded minute that is e-mailed for a planned start. */
export function notifiedMinute(plannedStartMin: number): number {
  return Math.round(plannedStartMin / EXPECTED_TIME_STEP_MIN) * EXPECTED_TIME_STEP_MIN;
}

/** Who at a customer site hears about a van visit: e-mail addresses with names. */
export async function siteContacts(db: Db, site: { id: number; organisation_id: number; contact_email: string | null; contact_name: string | null }) {
  const users = await db
    .selectFrom("users")
    .select(["email", "name", "site_id"])
    .where("organisation_id", "=", site.organisation_id)
    .where("status", "=", "active")
    .where("role", "in", [...CUSTOMER_ROLES])
    .where((eb) => eb.or([eb("site_id", "is", null), eb("site_id", "=", site.id)]))
    .orderBy("email")
    .execute();
  const atSite: { email: string; name: string | null }[] = users.filter((u) => u.site_id === site.id).map((u) => ({ email: u.email, name: u.name }));
  if (site.contact_email && !atSite.some((u) => u.email.toLowerCase() === site.contact_email!.toLowerCase())) {
    atSite.push({ email: site.contact_email, name: site.contact_name });
  }
  if (atSite.length > 0) return atSite;
  return users.filter((u) => u.site_id === null).map((u) => ({ email: u.email, name: u.name }));
}

export interface PublishResult {
  planId: number;
  /** Stops whose site was told a new or first time. */
  notifiedStops: number;
  /** Stops the site had been told about that are no longer on any run: the site was told so. */
  withdrawnStops: number;
  /** Messages queued in the outbox. */
  messages: number;
}

/** Publishes the day's plan and queues the expected-time notices, in one transaction. */
export async function publishPlan(db: Kysely<Database>, user: SessionUser, day: string, now = new Date()): Promise<PublishResult> {
  assertCan(user, "routes.plan");
  const env = serverEnv();
  const tz = env.UNIT_TIME_ZONE;
  const clock = planClock(day, tz);
  return db.transaction().execute(async (trx) => {
    const plan = await trx.selectFrom("route_plans").selectAll().where("day", "=", day).executeTakeFirst();
    if (!plan) throw notFound("The plan for that day");
    const stops = await trx
      .selectFrom("route_stops")
      .innerJoin("sites", "sites.id", "route_stops.site_id")
      .select([
        "route_stops.id",
        "route_stops.kind",
        "route_stops.planned_start_min",
        "route_stops.notified_start_min",
        "sites.id as site_id",
        "sites.organisation_id",
        "sites.name as site_name",
        "sites.contact_email",
        "sites.contact_name",
      ])
      .where("route_stops.plan_id", "=", plan.id)
      .where("route_stops.run_id", "is not", null)
      .where("route_stops.status", "=", "planned")
      .execute();
    if (stops.length === 0) throw new AppError("conflict", "The plan has no stops on any run yet: plan the day first.");
    let notifiedStops = 0;
    let messages = 0;
    const ordersOf = (stopId: number) =>
      trx
        .selectFrom("route_stop_orders")
        .innerJoin("orders", "orders.id", "route_stop_orders.order_id")
        .select(["orders.id", "orders.reference", "route_stop_orders.role"])
        .where("route_stop_orders.stop_id", "=", stopId)
        .orderBy("orders.reference")
        .execute();

    // Visits the site was told about that are now off every run: tell it, and forget the time sent.
    const withdrawn = await trx
      .selectFrom("route_stops")
      .innerJoin("sites", "sites.id", "route_stops.site_id")
      .select(["route_stops.id", "route_stops.notified_start_min", "sites.id as site_id", "sites.organisation_id", "sites.name as site_name", "sites.contact_email", "sites.contact_name"])
      .where("route_stops.plan_id", "=", plan.id)
      .where("route_stops.run_id", "is", null)
      .where("route_stops.status", "=", "planned")
      .where("route_stops.notified_start_min", "is not", null)
      .orderBy("route_stops.id")
      .execute();
    for (const stop of withdrawn) {
      const told = stop.notified_start_min!;
      const orders = await ordersOf(stop.id);
      const contacts = await siteContacts(trx, { id: stop.site_id, organisation_id: stop.organisation_id, contact_email: stop.contact_email, contact_name: stop.contact_name });
      for (const contact of contacts) {
        const mail = visitWithdrawnMail({
          recipientName: contact.name,
          siteName: stop.site_name,
          dayText: formatDate(clock.instantOf(told), tz),
          toldText: clockText(told, clock, tz),
          collectReferences: orders.filter((o) => o.role === "collect").map((o) => o.reference),
          deliverReferences: orders.filter((o) => o.role === "deliver").map((o) => o.reference),
          link: `${env.APP_URL}/clinic/orders`,
        });
        await enqueueMail(
          trx,
          { template: "route.visit_withdrawn", to: contact.email, organisationId: stop.organisation_id, dedupeKey: `route-stop:${stop.id}:withdrawn:${told}:${contact.email.toLowerCase()}`, ...mail },
          now,
        );
        messages++;
      }
      await trx.updateTable("route_stops").set({ notified_start_min: null, expected_time_notified_at: now.toISOString() }).where("id", "=", stop.id).execute();
    }

    for (const stop of stops) {
      if (stop.planned_start_min === null) continue;
      const minute = notifiedMinute(stop.planned_start_min);
      if (stop.notified_start_min !== null && notifiedMinute(stop.notified_start_min) === minute) continue;
      const orders = await ordersOf(stop.id);
      const deliverIds = orders.filter((o) => o.role === "deliver").map((o) => o.id);
      const deliverSets =
        deliverIds.length === 0
          ? 0
          : Number(
              (
                await trx
                  .selectFrom("cycles")
                  .select((eb) => eb.fn.countAll<number>().as("n"))
                  .where((eb) => eb.or([eb("return_order_id", "in", deliverIds), eb.and([eb("return_order_id", "is", null), eb("order_id", "in", deliverIds)])]))
                  .where("site_id", "=", stop.site_id)
                  .where("state", "in", ["released", "dispatched"])
                  .executeTakeFirstOrThrow()
              ).n,
            );
      const contacts = await siteContacts(trx, { id: stop.site_id, organisation_id: stop.organisation_id, contact_email: stop.contact_email, contact_name: stop.contact_name });
      for (const contact of contacts) {
        const mail = expectedVisitMail({
          recipientName: contact.name,
          siteName: stop.site_name,
          dayText: formatDate(clock.instantOf(minute), tz),
          expectedText: clockText(minute, clock, tz),
          rangeText: `${clockText(minute - RANGE_MIN, clock, tz)} and ${clockText(minute + RANGE_MIN, clock, tz)}`,
          collectReferences: orders.filter((o) => o.role === "collect").map((o) => o.reference),
          deliverReferences: orders.filter((o) => o.role === "deliver").map((o) => o.reference),
          deliverSets,
          link: `${env.APP_URL}/clinic/orders`,
          update: stop.notified_start_min !== null,
        });
        await enqueueMail(
          trx,
          { template: "route.expected_time", to: contact.email, organisationId: stop.organisation_id, dedupeKey: `route-stop:${stop.id}:${minute}:${contact.email.toLowerCase()}`, ...mail },
          now,
        );
        messages++;
      }
      await trx.updateTable("route_stops").set({ notified_start_min: minute, expected_time_notified_at: now.toISOString() }).where("id", "=", stop.id).execute();
      notifiedStops++;
    }
    await trx.updateTable("route_plans").set({ status: "published", published_by: user.id, published_at: now.toISOString() }).where("id", "=", plan.id).execute();
    await recordAudit(trx, { actorUserId: user.id, action: "route_plan.publish", entity: "route_plan", entityId: plan.id, details: { day, notifiedStops, withdrawnStops: withdrawn.length, messages } }, now);
    return { planId: plan.id, notifiedStops, withdrawnStops: withdrawn.length, messages };
  });
}

/** The expected delivery time of an order from the latest published plan that carries it, or null. */
export async function expectedDeliveryAt(db: Db, orderId: number, timeZone = serverEnv().UNIT_TIME_ZONE): Promise<Date | null> {
  const row = await db
    .selectFrom("route_stop_orders")
    .innerJoin("route_stops", "route_stops.id", "route_stop_orders.stop_id")
    .innerJoin("route_plans", "route_plans.id", "route_stops.plan_id")
    .select(["route_plans.day", "route_stops.planned_start_min"])
    .where("route_stop_orders.order_id", "=", orderId)
    .where("route_stop_orders.role", "=", "deliver")
    .where("route_plans.status", "=", "published")
    .where("route_stops.run_id", "is not", null)
    .where("route_stops.planned_start_min", "is not", null)
    .orderBy("route_plans.day", "desc")
    .executeTakeFirst();
  if (!row || row.planned_start_min === null) return null;
  return planClock(row.day, timeZone).instantOf(notifiedMinute(row.planned_start_min));
}
