import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { planDayWithin } from "@/lib/dispatch/plan";
import { serverEnv } from "@/lib/env";
import { addDays, dayText } from "@/lib/dispatch/days";
import type { SeedResult } from "./demo";

// The demo's vans, a week of drivers' shifts from the seed's day, and that day's plan (a draft
// the dispatcher can change and publish). Everything invented: codes, registrations, the third
// driver.

const VANS = [
  { code: "V1", name: "Long-wheelbase van 1", registration: "LM24 QXA", soiled: 4, clean: 4 },
  { code: "V2", name: "Long-wheelbase van 2", registration: "LM24 QXB", soiled: 4, clean: 4 },
  { code: "V3", name: "Short van", registration: "LM71 RDZ", soiled: 2, clean: 3 },
  { code: "V4", name: "Reserve van", registration: "LM19 TWE", soiled: 3, clean: 3 },
] as const;

const EXTRA_DRIVER = { name: "Ansel Kittering", email: "driver3@larkmoor.example" };

/** Shifts in local minutes: start, end, break window and length; the reserve van has no driver. */
const SHIFTS = [
  { email: "driver@larkmoor.example", van: "V1", start: 6 * 60 + 30, end: 15 * 60, breakFrom: 10 * 60 + 30, breakTo: 12 * 60, breakMin: 30 },
  { email: "driver2@larkmoor.example", van: "V2", start: 9 * 60, end: 17 * 60 + 30, breakFrom: 12 * 60 + 30, breakTo: 14 * 60, breakMin: 30 },
  { email: EXTRA_DRIVER.email, van: "V3", start: 11 * 60, end: 19 * 60, breakFrom: 14 * 60, breakTo: 16 * 60, breakMin: 30 },
] as const;

const SHIFT_DAYS = 7;
/** The planner's seed for the demo day; iterations bound the search so the demo is the same each time. */
const DEMO_SEED = 20261202;
const DEMO_ITERATIONS = 400;

export async function seedVans(trx: Transaction<Database>, seed: SeedResult, now: Date, passwordHash: string): Promise<{ vans: Record<string, number>; planDay: string }> {
  const iso = now.toISOString();
  const vans: Record<string, number> = {};
  for (const v of VANS) {
    const { id } = await trx
      .insertInto("vans")
      .values({ code: v.code, name: v.name, registration: v.registration, soiled_capacity_carts: v.soiled, clean_capacity_carts: v.clean, created_at: iso, updated_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    vans[v.code] = id;
  }
  const { id: driverId } = await trx
    .insertInto("users")
    .values({
      organisation_id: seed.organisations.LSS!,
      site_id: null,
      email: EXTRA_DRIVER.email,
      name: EXTRA_DRIVER.name,
      role: "driver",
      password_hash: passwordHash,
      status: "active",
      created_at: iso,
      updated_at: iso,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  seed.users[EXTRA_DRIVER.email] = driverId;

  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const today = dayText(now, timeZone);
  for (let offset = 0; offset < SHIFT_DAYS; offset++) {
    const day = addDays(today, offset);
    for (const s of SHIFTS) {
      await trx
        .insertInto("driver_shifts")
        .values({
          user_id: seed.users[s.email]!,
          day,
          start_min: s.start,
          end_min: s.end,
          break_earliest_min: s.breakFrom,
          break_latest_min: s.breakTo,
          break_duration_min: s.breakMin,
          van_id: vans[s.van]!,
          created_at: iso,
          updated_at: iso,
        })
        .execute();
    }
  }
  const dispatcher = seed.users["dispatch@larkmoor.example"]!;
  await planDayWithin(trx, { id: dispatcher, role: "dispatcher" }, { day: today, seed: DEMO_SEED }, now, DEMO_ITERATIONS);
  return { vans, planDay: today };
}
