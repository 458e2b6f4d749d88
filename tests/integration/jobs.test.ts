import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { getMailPreferences, saveMailPreferences } from "@/app/(clinic)/clinic/settings/preferences";
import type { SeedResult } from "@/db/seed/demo";
import { AppError } from "@/lib/errors";
import { expiryDigestJob } from "@/lib/jobs/expiry-digest";
import { weeklyPeriod } from "@/lib/jobs/schedule";
import { type Job, runDueJobs } from "@/lib/jobs/scheduler";
import { enqueueMail } from "@/lib/mail/outbox";
import { MAIL_KINDS, parseMailPreferences } from "@/lib/orders/mail-preferences";
import { countRows } from "../support/db";
import { deliveredCycle, freshSets } from "../support/delivered-cycles";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
const THEATRES = "Quillby Moor General – Main Theatres";
const DAY_CASE = "Quillby Moor General – Day Case Unit";
const OTTERWICK = "Otterwick Day Surgery Centre";
// Monday 7 December 2026, 07:00 in London (GMT): week 50's digest is due.
const MONDAY = new Date("2026-12-07T07:00:00Z");
const at = (iso: string) => new Date(iso);


const digests = () => t.db.selectFrom("outbox").selectAll().where("template", "=", "digest.expiry").orderBy("id").execute();
const serial: Record<string, string> = {};

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  // Only this file's sets carry an expiry date, so the lists hold exactly what it made.
  await t.db.updateTable("cycles").set({ expires_on: null }).execute();
  // The history replay queues no mail; start from an empty outbox all the same.
  await t.db.deleteFrom("outbox").execute();
  const plan: [string, string, string][] = [
    ["theatreSoon", THEATRES, "2026-12-10"],
    ["theatreExpired", THEATRES, "2026-12-05"],
    ["theatreLater", THEATRES, "2026-12-30"],
    ["dayCase", DAY_CASE, "2026-12-12"],
    ["otterwick", OTTERWICK, "2026-12-09"],
  ];
  for (const [name, site, expiresOn] of plan) {
    const [set] = await freshSets(t, site, 1, MONDAY);
    serial[name] = set!.serial;
    await deliveredCycle(t.db, set!.id, { expiresOn });
  }
});
afterAll(() => t.cleanup());

describe("the weekly expiry digest", () => {
  it("queues, on Monday at 07:00, each clinic user's own list — and nothing to those with nothing to report", async () => {
    // Sunday night: week 49's slot has passed but nothing has run yet, so week 49 runs now.
    // (A first run catches up the current week; it never goes further back.)
    const sunday = await runDueJobs(t.db, at("2026-12-06T22:00:00Z"), [expiryDigestJob]);
    expect(sunday).toEqual([expect.objectContaining({ name: "expiry_digest", period: "2026-W49", ran: true })]);
    await t.db.deleteFrom("outbox").execute();

    const reports = await runDueJobs(t.db, MONDAY, [expiryDigestJob]);
    expect(reports).toEqual([{ name: "expiry_digest", period: "2026-W50", ran: true, result: expect.objectContaining({ queued: 5 }) }]);
    const mail = await digests();
    expect(mail.map((m) => m.to_address).sort()).toEqual([
      "daycase@quillby.example",
      "manager@otterwick.example",
      "manager@quillby.example",
      "staff@otterwick.example",
      "theatres@quillby.example",
    ]);
    const to = (address: string) => mail.find((m) => m.to_address === address)!;

    // Clinic staff: their own site's sets only, soonest first, with the expired one called out.
    const staff = to("theatres@quillby.example");
    expect(staff.subject).toBe(`2 sets nearing expiry at ${THEATRES} (week 50)`);
    expect(staff.dedupe_key).toBe(`expiry_digest:${seed.users["theatres@quillby.example"]}:2026-W50`);
    expect(staff.organisation_id).toBe(seed.organisations.QMH);
    expect(staff.text_body).toContain(`${serial.theatreExpired} — `);
    expect(staff.text_body).toMatch(new RegExp(`${serial.theatreExpired} — .*: expired 2 days ago \\(5 Dec 2026\\)`));
    expect(staff.text_body).toMatch(new RegExp(`${serial.theatreSoon} — .*: expires in 3 days \\(10 Dec 2026\\)`));
    expect(staff.text_body.indexOf(serial.theatreExpired!)).toBeLessThan(staff.text_body.indexOf(serial.theatreSoon!));
    expect(staff.text_body).toContain("1 has already expired and must not be used");
    expect(staff.text_body).toContain("advisory");
    expect(staff.text_body).toContain("/clinic/expiring");
    expect(staff.text_body).not.toContain(serial.theatreLater);
    expect(staff.text_body).not.toContain(serial.dayCase);
    expect(staff.html_body).toContain(serial.theatreSoon);

    // The manager: every site of the organisation, and nobody else's.
    const manager = to("manager@quillby.example");
    expect(manager.subject).toBe("3 sets nearing expiry at all your sites (week 50)");
    for (const s of [serial.theatreSoon, serial.theatreExpired, serial.dayCase]) expect(manager.text_body).toContain(s);
    expect(manager.text_body).not.toContain(serial.otterwick);
    expect(to("daycase@quillby.example").text_body).not.toContain(serial.theatreSoon);
    for (const address of ["staff@otterwick.example", "manager@otterwick.example"]) {
      expect(to(address).text_body).toContain(serial.otterwick);
      expect(to(address).text_body).not.toMatch(/QMH-/);
    }

    const run = await t.db.selectFrom("job_runs").selectAll().where("name", "=", "expiry_digest").executeTakeFirstOrThrow();
    expect(run).toMatchObject({ last_period: "2026-W50", last_scheduled_at: MONDAY.toISOString(), last_run_at: MONDAY.toISOString(), runs: 2 });
    expect(JSON.parse(run.last_result)).toMatchObject({ queued: 5 });
  });

  it("does not send twice in a week, however often it is run, and sends again the next week", async () => {
    const count = async () => (await digests()).length;
    const first = await count();
    for (const when of ["2026-12-07T07:01:00Z", "2026-12-09T12:00:00Z", "2026-12-14T06:59:00Z"]) {
      const [report] = await runDueJobs(t.db, at(when), [expiryDigestJob]);
      expect(report, when).toMatchObject({ period: "2026-W50", ran: false });
    }
    expect(await count()).toBe(first);
    // Even the job itself, run again for the same week, queues nothing new (the dedupe key).
    await t.db.transaction().execute((trx) =>
      expiryDigestJob.run(trx, { now: at("2026-12-08T09:00:00Z"), period: weeklyPeriod(at("2026-12-08T09:00:00Z"), "Europe/London"), timeZone: "Europe/London" }),
    );
    expect(await count()).toBe(first);

    const [next] = await runDueJobs(t.db, at("2026-12-14T07:00:00Z"), [expiryDigestJob]);
    expect(next).toMatchObject({ period: "2026-W51", ran: true });
    const week51 = (await digests()).filter((m) => m.dedupe_key?.endsWith(":2026-W51"));
    expect(week51.length).toBe(5);
    // The clock going back to an earlier week runs nothing.
    const [back] = await runDueJobs(t.db, at("2026-12-08T07:00:00Z"), [expiryDigestJob]);
    expect(back).toMatchObject({ period: "2026-W50", ran: false });
  });

  it("respects each user's e-mail preferences", async () => {
    const daycase = await sessionUser(t.db, seed.users["daycase@quillby.example"]!);
    const prefs = await getMailPreferences(t.db, daycase);
    expect(prefs.expiry_digest).toBe(true);
    await saveMailPreferences(t.db, daycase, { ...prefs, expiry_digest: false }, at("2026-12-15T09:00:00Z"));
    const [report] = await runDueJobs(t.db, at("2026-12-21T07:00:00Z"), [expiryDigestJob]);
    expect(report).toMatchObject({ period: "2026-W52", ran: true });
    const week52 = (await digests()).filter((m) => m.dedupe_key?.endsWith(":2026-W52")).map((m) => m.to_address);
    expect(week52).not.toContain("daycase@quillby.example");
    expect(week52).toContain("manager@quillby.example");
    expect(week52.length).toBe(4);
  });

  it("sends nothing when no set is near its expiry", async () => {
    // Every listed set is used or sent back: mark them as used for a procedure.
    const open = await t.db
      .selectFrom("cycles")
      .select(["id", "organisation_id", "site_id", "set_id"])
      .where("state", "=", "delivered")
      .where("expires_on", "is not", null)
      .execute();
    for (const c of open) {
      await t.db
        .insertInto("procedure_uses")
        .values({ organisation_id: c.organisation_id, site_id: c.site_id, cycle_id: c.id, set_id: c.set_id, theatre: "Theatre 1", case_reference: `C-${c.id}`, pack_checked: 1, indicator_checked: 1, recorded_by: null, used_at: "2026-12-22T09:00:00.000Z" })
        .execute();
    }
    const before = (await digests()).length;
    const [report] = await runDueJobs(t.db, at("2026-12-28T07:00:00Z"), [expiryDigestJob]);
    expect(report).toMatchObject({ period: "2026-W53", ran: true, result: expect.objectContaining({ queued: 0 }) });
    expect((await digests()).length).toBe(before);
  });
});

describe("the scheduler across restarts and failures", () => {
  const ticks: string[] = [];
  const probe = (fail: () => boolean): Job => ({
    name: "probe",
    period: (now, timeZone) => weeklyPeriod(now, timeZone, 1, "07:00"),
    async run(trx, ctx) {
      await enqueueMail(trx, { template: "probe", to: "probe@larkmoor.example", subject: ctx.period.key, text: "x", html: "x", dedupeKey: `probe:${ctx.period.key}:${ticks.length}` }, ctx.now);
      ticks.push(ctx.period.key);
      if (fail()) throw new Error("relay of the probe exploded");
      return { week: ctx.period.key };
    },
  });
  const probeMail = () => t.db.selectFrom("outbox").select("subject").where("template", "=", "probe").execute();

  it("keeps nothing of a failed run and runs the period again on the next tick", async () => {
    const [failed] = await runDueJobs(t.db, at("2027-01-04T07:00:00Z"), [probe(() => true)]);
    expect(failed).toMatchObject({ name: "probe", period: "2027-W01", ran: false, error: "relay of the probe exploded" });
    expect(await probeMail()).toEqual([]);
    expect(await t.db.selectFrom("job_runs").select("name").where("name", "=", "probe").executeTakeFirst()).toBeUndefined();
    const [retried] = await runDueJobs(t.db, at("2027-01-04T07:01:00Z"), [probe(() => false)]);
    expect(retried).toMatchObject({ period: "2027-W01", ran: true, result: { week: "2027-W01" } });
    expect((await probeMail()).map((m) => m.subject)).toEqual(["2027-W01"]);
  });

  it("after a restart, neither repeats the week it finished nor skips the one it missed while down", async () => {
    // A restart later the same week: the stored period says it is done.
    const [same] = await runDueJobs(t.db, at("2027-01-06T15:00:00Z"), [probe(() => false)]);
    expect(same).toMatchObject({ period: "2027-W01", ran: false });
    // Down from Sunday to Wednesday: week 2's Monday slot was missed, and runs on restart.
    const [late] = await runDueJobs(t.db, at("2027-01-13T10:00:00Z"), [probe(() => false)]);
    expect(late).toMatchObject({ period: "2027-W02", ran: true });
    const row = await t.db.selectFrom("job_runs").selectAll().where("name", "=", "probe").executeTakeFirstOrThrow();
    expect(row).toMatchObject({ last_period: "2027-W02", last_scheduled_at: "2027-01-11T07:00:00.000Z", last_run_at: "2027-01-13T10:00:00.000Z", runs: 2 });
    expect((await probeMail()).map((m) => m.subject)).toEqual(["2027-W01", "2027-W02"]);
    // Jobs are independent: the digest's record is untouched by the probe.
    const digest = await t.db.selectFrom("job_runs").select("last_period").where("name", "=", "expiry_digest").executeTakeFirstOrThrow();
    expect(digest.last_period).toBe("2026-W53");
  });
});

describe("e-mail preferences", () => {
  it("saves a clinic user's choices with an audit entry, and refuses unit staff", async () => {
    const staff = await sessionUser(t.db, seed.users["theatres@quillby.example"]!);
    const all = Object.fromEntries(MAIL_KINDS.map((k) => [k, true])) as Record<(typeof MAIL_KINDS)[number], boolean>;
    const before = await countRows(t.db, ["audit_log"]);
    // Nothing changed: nothing written.
    await saveMailPreferences(t.db, staff, all);
    expect(await countRows(t.db, ["audit_log"])).toEqual(before);
    await saveMailPreferences(t.db, staff, { ...all, collected: false, ready: false });
    const row = await t.db.selectFrom("users").select("mail_preferences").where("id", "=", staff.id).executeTakeFirstOrThrow();
    expect(parseMailPreferences(row.mail_preferences)).toEqual({ ...all, collected: false, ready: false });
    const audit = await t.db.selectFrom("audit_log").selectAll().orderBy("id", "desc").limit(1).executeTakeFirstOrThrow();
    expect(audit).toMatchObject({ action: "user.mail_preferences_changed", entity: "user", entity_id: String(staff.id), actor_user_id: staff.id });
    expect(JSON.parse(audit.details)).toEqual({ on: [], off: ["collected", "ready"] });

    const tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
    const error = await saveMailPreferences(t.db, tech, all).then(() => null, (e: unknown) => e);
    expect(error).toBeInstanceOf(AppError);
    expect((error as AppError).code).toBe("forbidden");
    await expect(getMailPreferences(t.db, tech)).rejects.toThrow(/unit staff do not receive/);
  });
});
