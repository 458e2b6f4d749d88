import { sql, type Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { loadSessionUser } from "@/lib/auth/session-user";
import { contractTermsFor } from "@/lib/contracts/service";
import { applyCycleEvent, openCycle } from "@/lib/cycles/store";
import { serverEnv } from "@/lib/env";
import { parseOpeningHours } from "@/lib/sites/opening-hours";
import { finishReceiving, receiveScan } from "@/lib/stations/receiving";
import { isOpen, planReturn, type ServiceCalendar } from "@/lib/turnaround";
import type { SeedResult } from "./demo";

// The receiving station's part of the demo: this morning's pickup from the Otterwick centre came
// in one set short and with one set nobody booked. It was received through the station's own
// code (receiveScan, finishReceiving), so the clinic's order page shows both notices.
//
// Decisions:
// - The times are the site's last opening hours ending at least three hours before `now`: the van
//   collects in the last hour of the window and the sets are received 40 minutes later.
// - The sets are the site's highest serials that are free since before the order was booked, so
//   the lowest serials stay free for bookings in the demo and in tests.
// - The e-mails the notices queue are deleted in the same transaction: this happened before the
//   demo starts, as the history's own e-mails are.
// Deterministic: everything derives from `now` and the data seeded before.

const SITE = "Otterwick Day Surgery Centre";
const TECHNICIAN = "tech@larkmoor.example";
const BOOKER = "staff@otterwick.example";
const MINUTE = 60_000;

/** The end of the site's last open hour ending at least `before` ms before `now`, or null within a week. */
function lastOpenHourEnd(calendar: ServiceCalendar, now: number, before: number): number | null {
  const step = 15 * MINUTE;
  let end = Math.floor((now - before) / step) * step;
  for (let i = 0; i < (7 * 24 * 60) / 15; i++, end -= step) {
    if (isOpen(calendar, new Date(end - MINUTE)) && isOpen(calendar, new Date(end - 60 * MINUTE))) return end;
  }
  return null;
}

/** A fixed client event id for the n-th scan of this seed (a valid v4 UUID). */
const eventId = (n: number) => `5eed0000-0000-4000-8000-${String(n).padStart(12, "0")}`;

export async function seedReceiving(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<void> {
  const siteId = seed.sites[SITE];
  const techId = seed.users[TECHNICIAN];
  const bookerId = seed.users[BOOKER];
  if (!siteId || !techId || !bookerId) return;
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const site = await trx.selectFrom("sites").select(["organisation_id", "opening_hours"]).where("id", "=", siteId).executeTakeFirstOrThrow();
  const contract = await contractTermsFor(trx, site.organisation_id, now, timeZone);
  if (!contract) return;
  const calendar: ServiceCalendar = { timeZone, hours: parseOpeningHours(site.opening_hours), holidays: [] };
  const windowEnd = lastOpenHourEnd(calendar, now.getTime(), 3 * 60 * MINUTE);
  if (windowEnd === null) return;
  const windowStart = windowEnd - 60 * MINUTE;
  const bookedAt = new Date(windowStart - 20 * 60 * MINUTE);
  const collectedAt = new Date(windowEnd - 10 * MINUTE);
  const receivedAt = new Date(windowEnd + 40 * MINUTE);

  // Three booked sets and one more from the same shelf, free since before the booking.
  const free = await trx
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "set_types.set_class"])
    .where("sets.home_site_id", "=", siteId)
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where((eb) =>
      eb.not(
        eb.exists(
          eb
            .selectFrom("cycles")
            .select("cycles.id")
            .whereRef("cycles.set_id", "=", "sets.id")
            .where((c) =>
              c.or([
                c("cycles.state", "not in", ["delivered", "cancelled"]),
                c(sql<string>`coalesce(cycles.delivered_at, cycles.cancelled_at, cycles.updated_at)`, ">", bookedAt.toISOString()),
              ]),
            ),
        ),
      ),
    )
    .orderBy("sets.serial", "desc")
    .limit(4)
    .execute();
  if (free.length < 4) return;
  const [unbooked, ...booked] = free;

  const outboxBefore = await trx.selectFrom("outbox").select((eb) => eb.fn.max("id").as("id")).executeTakeFirst();
  const org = await trx.selectFrom("organisations").select("short_code").where("id", "=", site.organisation_id).executeTakeFirstOrThrow();
  const prefix = `${org.short_code}-P`;
  const last = await trx.selectFrom("orders").select("reference").where("reference", "like", `${prefix}%`).orderBy("reference", "desc").limit(1).executeTakeFirst();
  const reference = `${prefix}${String((last ? Number(last.reference.slice(prefix.length)) : 0) + 1).padStart(6, "0")}`;
  const neededBackBy = new Date(windowEnd + 3 * 24 * 60 * MINUTE);
  const plan = planReturn({
    calendar: contract.serviceCalendar,
    collectionWindowEnd: new Date(windowEnd),
    turnaroundHours: contract.turnaroundHours,
    neededBackBy,
    serviceLevel: "standard",
  });
  const { id: orderId } = await trx
    .insertInto("orders")
    .values({
      organisation_id: site.organisation_id,
      site_id: siteId,
      reference,
      kind: "pickup",
      status: "booked",
      service_level: "standard",
      collection_from: new Date(windowStart).toISOString(),
      collection_until: new Date(windowEnd).toISOString(),
      needed_back_by: neededBackBy.toISOString(),
      promised_return_at: plan.promisedAt.toISOString(),
      notes: "Three trays from the morning list.",
      created_by: bookerId,
      created_at: bookedAt.toISOString(),
      updated_at: bookedAt.toISOString(),
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  for (const set of booked) {
    const cycleId = await openCycle(trx, {
      organisationId: site.organisation_id,
      siteId,
      setId: set!.id,
      orderId,
      serviceLevel: "standard",
      heavySoil: false,
      outOfHours: false,
      loaner: false,
      neededBackBy: neededBackBy.toISOString(),
      promisedAt: plan.promisedAt.toISOString(),
      userId: bookerId,
      at: bookedAt,
    });
    await applyCycleEvent(trx, { cycleId, event: "collect", station: "van", userId: seed.users["driver@larkmoor.example"] ?? null, at: collectedAt });
  }

  const technician = await loadSessionUser(trx, { userId: techId, sessionVersion: 0 });
  if (!technician) return;
  // Two of the three arrive, with a set nobody booked; the third does not.
  await receiveScan(trx, technician, { code: booked[0]!.serial, clientEventId: eventId(1) }, receivedAt);
  await receiveScan(trx, technician, { code: unbooked!.serial, clientEventId: eventId(2), orderId }, new Date(receivedAt.getTime() + MINUTE));
  await receiveScan(trx, technician, { code: booked[1]!.serial, clientEventId: eventId(3) }, new Date(receivedAt.getTime() + 2 * MINUTE));
  await finishReceiving(trx, technician, { orderId }, new Date(receivedAt.getTime() + 5 * MINUTE));

  await trx.deleteFrom("outbox").where("id", ">", Number(outboxBefore?.id ?? 0)).execute();
}
