import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { serverEnv } from "@/lib/env";
import { localDateOf } from "@/lib/expiry/dates";
import { weekdayKey } from "@/lib/format";
import { toLocalDateTimeText } from "@/lib/local-time";
import { mulberry32, randomInt } from "@/lib/routing/random";
import { type OpeningHours, parseOpeningHours } from "@/lib/sites/opening-hours";
import type { SeedResult } from "./demo";

// The demo's record of sets used for procedures: a delivered set that went back to the unit
// afterwards was, in this scenario, opened for a procedure in between. Each such trip gets one
// use at a time between its delivery and its next booking (while the site is open, where a few
// draws find such a time), in one of the site's own rooms, with
// the clinic's case number (never a patient's name). A set's latest delivery stays unused, so it
// can be recorded in the demo. Like the rest of the history, these rows carry no audit entries.
// Deterministic: one seeded generator, cycles in id order.

const ROOMS: [RegExp, string[]][] = [
  [/Main Theatres/, ["Theatre 1", "Theatre 2", "Theatre 3", "Theatre 4", "Theatre 5", "Theatre 6"]],
  [/Day Case/, ["Day case room 1", "Day case room 2", "Day case room 3"]],
  [/Eye/, ["Eye theatre 1", "Eye theatre 2"]],
  [/Dental/, ["Surgery 1", "Surgery 2", "Surgery 3"]],
  [/Veterinary/, ["Theatre", "Prep room"]],
  [/Treatment Rooms/, ["Treatment room A", "Treatment room B"]],
];

/** True when the site is open at the instant (its procedures happen in opening hours). */
function isOpenAt(hours: OpeningHours, at: Date, timeZone: string): boolean {
  const time = toLocalDateTimeText(at, timeZone).slice(11);
  return hours[weekdayKey(at, timeZone)].some((i) => i.start <= time && time < i.end);
}

function roomsOf(siteName: string): string[] {
  return ROOMS.find(([pattern]) => pattern.test(siteName))?.[1] ?? ["Procedure room 1", "Procedure room 2"];
}

export async function seedProcedureUses(trx: Transaction<Database>, _seed: SeedResult, now: Date): Promise<number> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const rows = await trx
    .selectFrom("cycles")
    .innerJoin("sites", "sites.id", "cycles.site_id")
    .innerJoin("organisations", "organisations.id", "cycles.organisation_id")
    .select((eb) => [
      "cycles.id",
      "cycles.set_id",
      "cycles.organisation_id",
      "cycles.site_id",
      "cycles.delivered_at",
      "sites.name as site_name",
      "sites.opening_hours",
      "organisations.short_code",
      eb
        .selectFrom("cycles as next")
        .select((n) => n.fn.min("next.booked_at").as("at"))
        .whereRef("next.set_id", "=", "cycles.set_id")
        .whereRef("next.id", ">", "cycles.id")
        .where("next.state", "!=", "cancelled")
        .as("next_booked_at"),
    ])
    .where("cycles.state", "=", "delivered")
    .where("cycles.delivered_at", "is not", null)
    .orderBy("cycles.id")
    .execute();
  const people = await trx.selectFrom("users").select(["id", "role", "organisation_id", "site_id"]).where("status", "=", "active").execute();
  const recorderFor = (organisationId: number, siteId: number) =>
    people.find((p) => p.role === "clinic_staff" && p.site_id === siteId)?.id ??
    people.find((p) => p.role === "clinic_manager" && p.organisation_id === organisationId)?.id ??
    null;

  const rand = mulberry32(0x5e7_0012);
  const perOrganisationDay = new Map<string, number>();
  let count = 0;
  for (const c of rows) {
    if (!c.next_booked_at) continue;
    const delivered = Date.parse(c.delivered_at!);
    const next = Date.parse(String(c.next_booked_at));
    if (!(next > delivered)) continue;
    // A time while the site is open, when one of a few draws finds one.
    const hours = parseOpeningHours(c.opening_hours);
    let usedAt = new Date(delivered + (0.2 + 0.6 * rand()) * (next - delivered));
    for (let attempt = 0; attempt < 12 && !isOpenAt(hours, usedAt, timeZone); attempt++) {
      usedAt = new Date(delivered + (0.05 + 0.9 * rand()) * (next - delivered));
    }
    if (usedAt >= now) continue;
    const day = localDateOf(usedAt, timeZone);
    const key = `${c.organisation_id}:${day}`;
    const seq = (perOrganisationDay.get(key) ?? 0) + 1;
    perOrganisationDay.set(key, seq);
    const rooms = roomsOf(c.site_name);
    const theatre = rooms[randomInt(rand, rooms.length)]!;
    const caseReference = `${c.short_code}-${day.slice(2).replaceAll("-", "")}-${String(seq).padStart(3, "0")}`;
    const recordedBy = recorderFor(c.organisation_id, c.site_id);
    await trx
      .insertInto("procedure_uses")
      .values({
        organisation_id: c.organisation_id,
        site_id: c.site_id,
        cycle_id: c.id,
        set_id: c.set_id,
        theatre,
        case_reference: caseReference,
        pack_checked: 1,
        indicator_checked: 1,
        recorded_by: recordedBy,
        used_at: usedAt.toISOString(),
      })
      .execute();
    count++;
  }
  return count;
}
