import { createHash } from "node:crypto";
import { format, subDays } from "date-fns";
import { tz } from "@date-fns/tz";
import { sql, type Transaction } from "kysely";
import type { Database, LoadStatus } from "@/db/schema";
import { recordToCsv } from "@/lib/cycles/csv";
import { parseSterilizerRecord } from "@/lib/cycles/parse";
import { checkSterilizerLoad } from "@/lib/cycles/sterilizer";
import { synthSterilizerRecord } from "@/lib/cycles/synth";
import { serverEnv } from "@/lib/env";
import { parseRequirement, type SteamCycleRequirement } from "@/lib/machines/requirements";
import { parseLocalDateTime } from "@/lib/local-time";
import { recallMail } from "@/lib/mail/templates";
import type { LoadFigures } from "@/lib/sterilising/checks";
import { DEFAULT_LEAK_LIMIT_KPA_MIN } from "@/lib/sterilising/settings";
import { DEFAULT_SHELF_LIFE_RULES, expiryFor, type StorageKind } from "@/lib/sterilising/shelf-life";
import { fileStore } from "@/lib/storage/store";
import { batchNumberPrefix, nextBatchNumber } from "@/lib/washing/numbering";
import type { SeedResult } from "./demo";

// The steriliser side of the demo's 90 days: each steriliser's daily air-removal (Bowie-Dick
// type) and vacuum leak tests, the loads behind the history's "sterilise" events with their
// records and indicator results, the expiry dates the releases gave, and one load that failed
// after release with its recall and the e-mail to the customer.
//
// Decisions:
// - The history records every sterilisation as a "sterilise" event at the sterilising station
//   (and its release at the release station) without a load. Events at most 10 minutes apart
//   that fit the chamber form one load, which ended just before the first of them; S1 (6 StU)
//   takes it when free, else S2 (8 StU). Sets sterilised at low temperature are left out.
// - Scan events are append-only and keep their empty load_id: load_items is the link (the label
//   falls back to it).
// - Tests: every unit day at 06:30 (or 15 minutes before the day's first load, when earlier),
//   both pass, leak rates 0.03–0.09 kPa/min against the 0.13 limit. 37 days ago S2's air-removal
//   test failed: S2 ran no load that day. Today's tests are recorded on S1 only (S2 not yet).
// - Records: 3 air-removal pulses, 135 °C held 4 min (program P134: 134 °C, 3.5 min), one sample
//   every 10 s with ±0.2 K noise from a generator seeded by the load's place in time.
// - Indicators: a type 4 chemical indicator in every load; a biological indicator in the first
//   load of each week on each steriliser (read: no growth).
// - The recall: the most recent load released at least 5 days ago whose sets all left the unit,
//   one of them used for a procedure and at least one still at the clinic (not booked again),
//   failed after release (its biological indicator grew at the 48 h read-out). Sets still out
//   are recalled; sets booked again since count as back when their next trip was received. The
//   customers' managers were e-mailed (the messages marked sent at the time).

const MINUTE = 60_000;
const CLUSTER_WINDOW_MS = 10 * MINUTE;
const STERILISERS = [
  { code: "S1", capacityStu: 6 },
  { code: "S2", capacityStu: 8 },
] as const;
const PROGRAM = "P134";
const RUN_MS = 19 * MINUTE; // the synthetic record's length
const FAILED_TEST_DAYS_AGO = 37;
const DAYS = 90;

export interface LoadsSeed {
  loads: number;
  tests: number;
  recallId: number | null;
  /** Load ids by number. */
  byNumber: Record<string, number>;
}

interface SterEvent {
  eventId: number;
  cycleId: number;
  at: number;
  userId: number | null;
  sizeStu: number;
}

function rand(seed: number): () => number {
  let s = seed >>> 0 || 1;
  return () => {
    s = (s * 1664525 + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

async function storeRecord(trx: Transaction<Database>, csv: string, name: string, uploadedBy: number | null, at: string): Promise<number> {
  const bytes = Buffer.from(csv, "utf8");
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const key = `demo/${sha256}`;
  await fileStore().put(key, bytes, "text/csv", { replace: true });
  const { id } = await trx
    .insertInto("files")
    .values({ organisation_id: null, purpose: "cycle_record", original_name: name, content_type: "text/csv", size_bytes: bytes.length, sha256, storage_key: key, uploaded_by: uploadedBy, created_at: at })
    .returning("id")
    .executeTakeFirstOrThrow();
  return id;
}

export async function seedLoads(trx: Transaction<Database>, result: SeedResult, now: Date): Promise<LoadsSeed> {
  const machines = result.machines;
  const programs = result.programs;
  if (!machines || !programs) throw new Error("Seed the machines before the steriliser loads.");
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const quality = result.users["quality@larkmoor.example"] ?? null;
  const tech = result.users["tech@larkmoor.example"] ?? null;
  const day = (at: Date) => format(at, "yyyy-MM-dd", { in: tz(timeZone) });
  const today = day(now);
  const failedDay = day(subDays(now, FAILED_TEST_DAYS_AGO));

  const requirement = new Map<string, SteamCycleRequirement>();
  for (const s of STERILISERS) {
    const id = programs[`${s.code}/${PROGRAM}`];
    if (machines[s.code] === undefined || id === undefined) throw new Error(`The demo machines have no ${s.code} with program ${PROGRAM}.`);
    const row = await trx.selectFrom("programs").select("requirement").where("id", "=", id).executeTakeFirstOrThrow();
    const r = parseRequirement(row.requirement);
    if (!r || r.kind !== "steam") throw new Error(`Program ${PROGRAM} of ${s.code} is not a steam cycle.`);
    requirement.set(s.code, r);
  }

  // The history's sterilisations, oldest first.
  const rows = await trx
    .selectFrom("scan_events as e")
    .innerJoin("sets as s", "s.id", "e.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .select(["e.id", "e.cycle_id", "e.at", "e.user_id", "st.size_stu"])
    .where("e.event", "=", "sterilise")
    .where("e.load_id", "is", null)
    .where("st.sterilisation_method", "!=", "low_temperature")
    .where("e.at", "<=", now.toISOString())
    .orderBy("e.at")
    .orderBy("e.id")
    .execute();
  const events: SterEvent[] = rows.map((r) => ({ eventId: r.id, cycleId: r.cycle_id, at: Date.parse(r.at), userId: r.user_id, sizeStu: r.size_stu }));

  // Clusters, each placed on a steriliser.
  const busyUntil: Record<string, number> = { S1: 0, S2: 0 };
  interface Planned {
    code: string;
    events: SterEvent[];
    startedAt: number;
    endedAt: number;
  }
  const planned: Planned[] = [];
  let current: { events: SterEvent[]; stu: number } | null = null;
  const flush = () => {
    if (!current) return;
    const firstAt = current.events[0]!.at;
    const endedAt = Math.round((firstAt - 2 * MINUTE) / 1000) * 1000;
    const startedAt = endedAt - RUN_MS;
    const unitDay = day(new Date(startedAt));
    const candidates = STERILISERS.filter((s) => s.capacityStu + 1e-9 >= current!.stu && !(s.code === "S2" && unitDay === failedDay));
    const free = candidates.find((s) => busyUntil[s.code]! <= startedAt) ?? candidates.reduce((a, b) => (busyUntil[a.code]! <= busyUntil[b.code]! ? a : b));
    busyUntil[free.code] = endedAt;
    planned.push({ code: free.code, events: current.events, startedAt, endedAt });
    current = null;
  };
  for (const e of events) {
    if (current && (e.at - current.events[0]!.at > CLUSTER_WINDOW_MS || current.stu + e.sizeStu > 6)) flush();
    if (!current) current = { events: [], stu: 0 };
    current.events.push(e);
    current.stu += e.sizeStu;
  }
  flush();

  // Daily tests: 90 unit days back from today; S2 not yet today; one failed day on S2.
  const firstStart = new Map<string, number>();
  for (const p of planned) {
    const key = `${p.code}/${day(new Date(p.startedAt))}`;
    firstStart.set(key, Math.min(firstStart.get(key) ?? Infinity, p.startedAt));
  }
  const testIds = new Map<string, number>();
  const r = rand(4242);
  let tests = 0;
  for (let d = DAYS - 1; d >= 0; d--) {
    const unitDay = day(subDays(now, d));
    for (const s of STERILISERS) {
      if (s.code === "S2" && unitDay === today) continue;
      const morning = parseLocalDateTime(`${unitDay}T06:30`, timeZone)!.getTime();
      const at = Math.min(morning, (firstStart.get(`${s.code}/${unitDay}`) ?? Infinity) - 15 * MINUTE);
      if (at > now.getTime()) continue;
      const iso = new Date(at).toISOString();
      const failed = s.code === "S2" && unitDay === failedDay;
      const { id } = await trx
        .insertInto("machine_tests")
        .values({
          machine_id: machines[s.code]!,
          kind: "air_removal",
          unit_day: unitDay,
          result: failed ? "fail" : "pass",
          notes: failed ? "Uneven colour change at the centre of the test sheet. Steriliser taken out of use for the day; engineer called." : null,
          performed_by: quality,
          performed_at: iso,
          created_at: iso,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      testIds.set(`${s.code}/${unitDay}`, id);
      const rate = Math.round((0.03 + r() * 0.06) * 1000) / 1000;
      const leakAt = new Date(at + 20 * MINUTE).toISOString();
      await trx
        .insertInto("machine_tests")
        .values({ machine_id: machines[s.code]!, kind: "leak", unit_day: unitDay, result: "pass", leak_rate_kpa_min: rate, leak_limit_kpa_min: DEFAULT_LEAK_LIMIT_KPA_MIN, performed_by: quality, performed_at: leakAt, created_at: leakAt })
        .execute();
      tests += 2;
    }
  }

  // Loads with their records.
  const numbers = new Map<string, string[]>();
  const seed: LoadsSeed = { loads: 0, tests, recallId: null, byNumber: {} };
  const biWeeks = new Set<string>();
  const rules = DEFAULT_SHELF_LIFE_RULES;
  for (const [index, plan] of planned.entries()) {
    const startedIso = new Date(plan.startedAt).toISOString();
    const csv = recordToCsv(synthSterilizerRecord({ plateauTempC: 135, plateauSeconds: 240, stepSeconds: 10, noiseK: 0.2, seed: index + 1 }), { startedAt: startedIso, decimals: 1 });
    const record = parseSterilizerRecord(csv);
    const check = checkSterilizerLoad(record, requirement.get(plan.code)!);
    if (!check.passed) throw new Error(`The demo record of load ${index} does not pass: ${check.reasons.join(" ")}`);
    const prefix = batchNumberPrefix(plan.code, new Date(plan.startedAt), timeZone);
    const used = numbers.get(prefix) ?? [];
    const number = nextBatchNumber(prefix, used);
    numbers.set(prefix, [...used.slice(-1), number]);
    const userId = plan.events[0]!.userId ?? tech;
    const finishedIso = new Date(plan.events[0]!.at).toISOString();
    const fileId = await storeRecord(trx, csv, `${number}.csv`, userId, finishedIso);
    const cycleIds = [...new Set(plan.events.map((e) => e.cycleId))];
    const releases = await trx
      .selectFrom("scan_events")
      .select(["id", "cycle_id", "at", "user_id"])
      .where("event", "=", "release")
      .where("cycle_id", "in", cycleIds)
      .where("at", ">=", finishedIso)
      .orderBy("at")
      .execute();
    const states = await trx.selectFrom("cycles").select(["id", "state"]).where("id", "in", cycleIds).execute();
    const status: LoadStatus = releases.length > 0 ? "released" : states.some((s) => s.state === "sterilised") ? "awaiting_release" : "failed";
    const weekKey = `${plan.code}/${format(new Date(plan.startedAt), "RRRR-II", { in: tz(timeZone) })}`;
    const withBi = !biWeeks.has(weekKey);
    biWeeks.add(weekKey);
    const f = check.figures;
    const figures: LoadFigures = {
      f0: f.f0,
      band: f.band,
      holdSeconds: f.holdSeconds,
      plateauStartS: f.plateauStartS,
      plateauEndS: f.plateauEndS,
      plateauMinTempC: f.plateauMinTempC,
      plateauMaxTempC: f.plateauMaxTempC,
      saturation: f.saturation,
      peakTempC: f.peakTempC,
      durationSeconds: f.durationSeconds,
    };
    const { id } = await trx
      .insertInto("steriliser_loads")
      .values({
        number,
        machine_id: machines[plan.code]!,
        program_id: programs[`${plan.code}/${PROGRAM}`]!,
        status,
        air_removal_test_id: testIds.get(`${plan.code}/${day(new Date(plan.startedAt))}`) ?? null,
        created_by: userId,
        created_at: new Date(plan.startedAt - 10 * MINUTE).toISOString(),
        started_by: userId,
        started_at: startedIso,
        ended_at: new Date(plan.startedAt + f.durationSeconds * 1000).toISOString(),
        finished_by: userId,
        record_file_id: fileId,
        figures: JSON.stringify(figures),
        reasons: "[]",
        record_passed: 1,
        ci_type: 4,
        ci_result: "pass",
        bi_result: withBi ? (status === "awaiting_release" ? "pending" : "pass") : "not_used",
        bi_lot: withBi ? `GS-${prefix.slice(-4)}-${(index % 9) + 1}` : null,
        bi_read_at: withBi && status !== "awaiting_release" ? new Date(plan.startedAt + 24 * 60 * MINUTE).toISOString() : null,
        bi_read_by: withBi && status !== "awaiting_release" ? quality : null,
        decision_by: releases[0]?.user_id ?? (status === "failed" ? quality : null),
        decision_at: releases[0]?.at ?? (status === "failed" ? finishedIso : null),
        decision_notes: status === "failed" ? "Every set of the load was held or sent back to washing." : null,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await trx
      .insertInto("load_items")
      .values(cycleIds.map((cycleId, i) => ({ load_id: id, cycle_id: cycleId, added_by: userId, added_at: new Date(plan.startedAt - 5 * MINUTE + i * 5000).toISOString() })))
      .execute();
    // Expiry dates the release gave, from the default rules (DIN 58953-8 guide values).
    if (status === "released") {
      const cycles = await trx
        .selectFrom("cycles as c")
        .innerJoin("sets as s", "s.id", "c.set_id")
        .innerJoin("set_types as st", "st.id", "s.set_type_id")
        .innerJoin("sites as si", "si.id", "c.site_id")
        .select(["c.id", "c.sterilised_at", "c.expires_on", "st.packaging", "si.sterile_storage", sql<string | null>`(select p.packaging from pack_records p where p.cycle_id = c.id and p.outcome = 'packed' order by p.at desc limit 1)`.as("packed_as")])
        .where("c.id", "in", cycleIds)
        .execute();
      for (const c of cycles) {
        if (c.expires_on || !c.sterilised_at) continue;
        const expiry = expiryFor(rules, { packaging: c.packed_as ?? c.packaging, storage: c.sterile_storage as StorageKind, sterilisedAt: new Date(c.sterilised_at), timeZone });
        if (expiry.ok) await trx.updateTable("cycles").set({ expires_on: expiry.date }).where("id", "=", c.id).execute();
      }
    }
    seed.byNumber[number] = id;
    seed.loads += 1;
  }

  seed.recallId = await seedRecall(trx, result, now);
  return seed;
}

/** The demo's one recall: a released load whose sets were all delivered and used, failed afterwards. */
async function seedRecall(trx: Transaction<Database>, result: SeedResult, now: Date): Promise<number | null> {
  const quality = result.users["quality@larkmoor.example"] ?? null;
  const candidates = await trx
    .selectFrom("steriliser_loads as l")
    .select(["l.id", "l.number", "l.decision_at"])
    .where("l.status", "=", "released")
    .where("l.decision_at", "<=", new Date(now.getTime() - 5 * 24 * 60 * MINUTE).toISOString())
    // Every set of it left the unit; at least one is still out at the clinic (not booked again).
    .where((eb) =>
      eb.not(
        eb.exists(
          eb.selectFrom("load_items as i").innerJoin("cycles as c", "c.id", "i.cycle_id").select("i.cycle_id").whereRef("i.load_id", "=", "l.id").where("c.state", "not in", ["released", "dispatched", "delivered"]),
        ),
      ),
    )
    .where((eb) =>
      eb.exists(
        eb
          .selectFrom("load_items as i")
          .innerJoin("cycles as c", "c.id", "i.cycle_id")
          .select("i.cycle_id")
          .whereRef("i.load_id", "=", "l.id")
          .where((w) => w.not(w.exists(w.selectFrom("cycles as later").select("later.id").whereRef("later.set_id", "=", "c.set_id").whereRef("later.booked_at", ">", "c.booked_at").where("later.state", "!=", "cancelled")))),
      ),
    )
    .where((eb) => eb.exists(eb.selectFrom("load_items as i").innerJoin("procedure_uses as u", "u.cycle_id", "i.cycle_id").select("u.id").whereRef("i.load_id", "=", "l.id")))
    .orderBy("l.decision_at", "desc")
    .limit(60)
    .execute();
  // Sets other demo flows take as free (the first third, at least eight, of each site's sets by
  // serial: db/seed/history.ts keeps them out of open orders) are not recalled.
  const sets = await trx.selectFrom("sets").select(["id", "home_site_id"]).where("status", "=", "in_service").orderBy("serial").execute();
  const reserved = new Set<number>();
  for (const siteId of new Set(sets.map((x) => x.home_site_id))) {
    const own = sets.filter((x) => x.home_site_id === siteId);
    for (const x of own.slice(0, Math.max(8, Math.ceil(own.length / 3)))) reserved.add(x.id);
  }
  let load: (typeof candidates)[number] | undefined;
  for (const candidate of candidates) {
    const out = await trx
      .selectFrom("load_items as i")
      .innerJoin("cycles as c", "c.id", "i.cycle_id")
      .select("c.set_id")
      .where("i.load_id", "=", candidate.id)
      .where((w) => w.not(w.exists(w.selectFrom("cycles as later").select("later.id").whereRef("later.set_id", "=", "c.set_id").whereRef("later.booked_at", ">", "c.booked_at").where("later.state", "!=", "cancelled"))))
      .execute();
    if (out.every((o) => !reserved.has(o.set_id))) {
      load = candidate;
      break;
    }
  }
  if (!load) return null;
  const raisedAt = new Date(Date.parse(load.decision_at!) + 2 * 24 * 60 * MINUTE);
  const iso = raisedAt.toISOString();
  const reason = "The biological indicator of this load showed growth at the 48 h read-out.";
  await trx.updateTable("steriliser_loads").set({ status: "failed", failed_after_release: 1, decision_notes: reason, decision_at: iso, decision_by: quality, bi_result: "fail", bi_lot: "GS-DEMO-7", bi_read_at: iso, bi_read_by: quality }).where("id", "=", load.id).execute();
  const number = `R-${load.number}`;
  const { id: recallId } = await trx.insertInto("recalls").values({ number, load_id: load.id, reason, status: "open", created_by: quality, created_at: iso }).returning("id").executeTakeFirstOrThrow();
  const cycles = await trx
    .selectFrom("load_items as i")
    .innerJoin("cycles as c", "c.id", "i.cycle_id")
    .innerJoin("sets as s", "s.id", "c.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .innerJoin("sites as si", "si.id", "c.site_id")
    .select(["c.id", "c.set_id", "c.organisation_id", "c.site_id", "c.state", "c.booked_at", "s.serial", "st.name as type_name", "si.name as site_name"])
    .where("i.load_id", "=", load.id)
    .orderBy("s.serial")
    .execute();
  for (const c of cycles) {
    // A set booked again since was reprocessed on its next trip: it counts as back when received.
    const later = await trx
      .selectFrom("cycles")
      .select(["received_at", "booked_at"])
      .where("set_id", "=", c.set_id)
      .where("id", "!=", c.id)
      .where("booked_at", ">", c.booked_at)
      .where("state", "!=", "cancelled")
      .orderBy("booked_at")
      .executeTakeFirst();
    await trx
      .insertInto("recall_items")
      .values({ recall_id: recallId, cycle_id: c.id, set_id: c.set_id, organisation_id: c.organisation_id, site_id: c.site_id, state_at_recall: c.state, returned_at: later ? (later.received_at ?? later.booked_at) : null })
      .execute();
    if (later) continue;
    // The recall event, as applyCycleEvent writes it (the history's cycles are seeded directly).
    await trx.updateTable("cycles").set({ state: "recalled", updated_at: iso }).where("id", "=", c.id).execute();
    await trx
      .insertInto("scan_events")
      .values({ cycle_id: c.id, set_id: c.set_id, organisation_id: c.organisation_id, event: "recall", from_state: c.state, to_state: "recalled", station: "quality", load_id: load.id, user_id: quality, at: iso, details: JSON.stringify({ recall: number, reason }) })
      .execute();
  }
  for (const organisationId of [...new Set(cycles.map((c) => c.organisation_id))]) {
    const org = await trx.selectFrom("organisations").select("name").where("id", "=", organisationId).executeTakeFirstOrThrow();
    const managers = await trx.selectFrom("users").select("email").where("organisation_id", "=", organisationId).where("role", "=", "clinic_manager").orderBy("email").execute();
    if (managers.length === 0) continue;
    const mail = recallMail({
      organisationName: org.name,
      recallNumber: number,
      loadNumber: load.number,
      reason,
      sets: cycles.filter((c) => c.organisation_id === organisationId).map((c) => ({ serial: c.serial, typeName: c.type_name, siteName: c.site_name })),
      link: `${serverEnv().APP_URL}/clinic/recalls/${recallId}`,
    });
    await trx
      .insertInto("outbox")
      .values({
        template: "recall",
        organisation_id: organisationId,
        to_address: managers.map((m) => m.email).join(", "),
        subject: mail.subject,
        text_body: mail.text,
        html_body: mail.html,
        message_id: `<recall-${recallId}-${organisationId}@steamlane.local>`,
        dedupe_key: `recall:${recallId}:org:${organisationId}`,
        status: "sent",
        next_attempt_at: iso,
        created_at: iso,
        sent_at: new Date(raisedAt.getTime() + MINUTE).toISOString(),
      })
      .execute();
  }
  return recallId;
}
