import { NextRequest } from "next/server";
import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import { POST as uploadRoute } from "@/app/api/files/route";
import { GET as getProblemRoute } from "@/app/api/problems/[id]/route";
import { GET as listProblemsRoute } from "@/app/api/problems/route";
import type { SeedResult } from "@/db/seed/demo";
import { DEMO_PROBLEMS } from "@/db/seed/problems";
import type { SessionUser } from "@/lib/auth/session-user";
import { applyCycleEvent, type Station } from "@/lib/cycles/store";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { answerProblemAction, reportProblemAction } from "@/lib/problems/actions";
import { answerProblemSchema, listProblemsQuerySchema, reportProblemSchema } from "@/lib/problems/schemas";
import { answerProblem, listOrderProblems, listProblems, reportProblem } from "@/lib/problems/service";
import { bookedPickup } from "../support/bookings";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionCookie, sessionUser } from "../support/session";

// Reporting problems with delivered sets and answering them, through the server actions and route
// handlers, on the seeded demo. The signed-in user of an action is supplied here (next-auth reads
// it from the request's cookies, which an action called in a test has not).
const session = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/current-user", async (importOriginal) => ({
  ...(await importOriginal<typeof import("@/lib/auth/current-user")>()),
  getCurrentUser: async () => session.user,
}));

let t: DemoDatabase;
let seed: SeedResult;
// Tuesday 1 December 2026, 10:00 in London: the demo's contracts are in force.
const NOW = new Date("2026-12-01T10:00:00Z");
const THEATRES = "Quillby Moor General – Main Theatres";
const DAY_CASE = "Quillby Moor General – Day Case Unit";
const OTTERWICK = "Otterwick Day Surgery Centre";
const TABLES = ["problems", "audit_log", "outbox", "files"] as const;

const userId = (email: string) => seed.users[email]!;
const as = (email: string) => sessionUser(t.db, userId(email));

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
});
afterAll(() => t.cleanup());
beforeEach(() => {
  session.user = null;
});

/** A 1×1 PNG (the bytes of the smallest valid image). */
const PNG = Uint8Array.from(
  Buffer.from("iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAYAAAAfFcSJAAAADUlEQVR42mP8z8BQDwAEhQGAhKmMIQAAAABJRU5ErkJggg==", "base64"),
);

async function upload(email: string, purpose: string, bytes: Uint8Array = PNG, name = "photo.png"): Promise<number> {
  const form = new FormData();
  form.set("file", new File([bytes as Uint8Array<ArrayBuffer>], name));
  form.set("purpose", purpose);
  const headers = new Headers({ host: "localhost:3000", origin: "http://localhost:3000", cookie: await sessionCookie(userId(email)) });
  const res = await uploadRoute(new NextRequest(new URL("/api/files", "http://localhost:3000"), { method: "POST", headers, body: form }), params({}));
  expect(res.status).toBe(200);
  return (await res.json()).id;
}

/** Non-loaner sets of a site with no open cycle, in serial order (each call moves past the ones it returned). */
const taken = new Set<number>();
async function freeSets(siteName: string, n: number): Promise<number[]> {
  const rows = await t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select("sets.id")
    .where("sets.home_site_id", "=", seed.sites[siteName]!)
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where((eb) => eb.not(eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]))))
    .orderBy("sets.serial")
    .execute();
  const ids = rows.map((r) => r.id).filter((id) => !taken.has(id)).slice(0, n);
  ids.forEach((id) => taken.add(id));
  return ids;
}

const ROUTE: [CycleEvent, Station][] = [
  ["collect", "van"],
  ["receive", "receiving"],
  ["wash_passed", "washing"],
  ["pack", "packing"],
  ["sterilise", "sterilising"],
  ["release", "release"],
  ["dispatch", "dispatch"],
  ["deliver", "van"],
];

/** Books a pickup of n sets at a site and moves the first `deliver` of them to delivered. */
async function order(email: string, siteName: string, n: number, deliver = n) {
  const { orderId, reference, cycles } = await bookedPickup(t, email, siteName, await freeSets(siteName, n), NOW);
  for (const c of cycles.slice(0, deliver)) {
    for (const [event, station] of ROUTE) await applyCycleEvent(t.db, { cycleId: c.cycleId, event, station, userId: null, at: NOW });
  }
  return { orderId, reference, cycles: cycles.map((c) => ({ cycleId: c.cycleId, setId: c.setId, serial: c.serial })) };
}

const report = (overrides: Record<string, unknown>) =>
  reportProblemSchema.parse({ kind: "damaged_instrument", description: "Jaws of the needle holder do not close.", photoFileId: null, cycleId: null, ...overrides });

async function getProblem(email: string, id: number | string) {
  const res = await getProblemRoute(await requestAs(userId(email), `/api/problems/${id}`), params({ id: String(id) }));
  return { status: res.status, body: await res.json() };
}

async function list(email: string, query = "") {
  const res = await listProblemsRoute(await requestAs(userId(email), `/api/problems?${query}`), params({}));
  return { status: res.status, body: await res.json() };
}

describe("the demo's problems", () => {
  it("are reported on delivered sets of the reporter's own site, before the seed's now, answered ones after their report", async () => {
    const seedNow = "2026-12-01T08:00:00.000Z";
    const rows = await t.db
      .selectFrom("problems")
      .innerJoin("orders", "orders.id", "problems.order_id")
      .innerJoin("users", "users.id", "problems.reported_by")
      .select([
        "problems.id",
        "problems.kind",
        "problems.status",
        "problems.cycle_id",
        "problems.organisation_id",
        "problems.site_id",
        "problems.created_at",
        "problems.answered_at",
        "problems.answer",
        "orders.organisation_id as order_org",
        "orders.site_id as order_site",
        "users.organisation_id as reporter_org",
        "users.site_id as reporter_site",
      ])
      .execute();
    // Every scripted problem found a delivery in the 90 days of history.
    expect(rows.length).toBe(DEMO_PROBLEMS.length);
    for (const r of rows) {
      expect(r.organisation_id).toBe(r.order_org);
      expect(r.reporter_org).toBe(r.organisation_id);
      expect(r.site_id).toBe(r.order_site);
      if (r.reporter_site !== null) expect(r.site_id).toBe(r.reporter_site);
      expect(r.created_at < seedNow).toBe(true);
      if (r.status === "answered") {
        expect(r.answer).toBeTruthy();
        expect(r.answered_at! > r.created_at && r.answered_at! < seedNow).toBe(true);
      } else {
        expect([r.answer, r.answered_at]).toEqual([null, null]);
      }
    }
    const onSets = await t.db
      .selectFrom("problems")
      .innerJoin("cycles", "cycles.id", "problems.cycle_id")
      .select(["problems.created_at", "cycles.delivered_at", "cycles.state", "cycles.set_id", "problems.set_id as problem_set", "cycles.order_id", "problems.order_id as problem_order"])
      .execute();
    expect(onSets.length).toBe(DEMO_PROBLEMS.filter((p) => !p.wholeOrder).length);
    for (const r of onSets) {
      expect(r.state).toBe("delivered");
      expect(r.created_at > r.delivered_at!).toBe(true);
      expect([r.problem_set, r.problem_order]).toEqual([r.set_id, r.order_id]);
    }
    expect(rows.filter((r) => r.status === "open").length).toBe(DEMO_PROBLEMS.filter((p) => !p.answer).length);
    // The answers were given before the demo starts: nothing to e-mail.
    expect(await t.db.selectFrom("outbox").select("id").where("template", "=", "problem.answered").execute()).toEqual([]);
    const audit = await t.db.selectFrom("audit_log").select("action").where("entity", "=", "problem").execute();
    expect(audit.length).toBe(DEMO_PROBLEMS.length + DEMO_PROBLEMS.filter((p) => p.answer).length);
  });
});

describe("reporting a problem", () => {
  it("records a damaged instrument with a photo, audited, and shows it to the clinic and the unit", async () => {
    const o = await order("theatres@quillby.example", THEATRES, 2);
    const photoId = await upload("theatres@quillby.example", "problem_photo");
    session.user = await as("theatres@quillby.example");
    const result = await reportProblemAction({
      orderId: o.orderId,
      cycleId: o.cycles[0]!.cycleId,
      kind: "damaged_instrument",
      description: "  The tip of the curved Mayo scissors is bent; found when opening the tray.  ",
      photoFileId: photoId,
    });
    expect(result).toMatchObject({ ok: true });
    if (!result.ok) return;
    const id = result.data.problemId;
    const row = await t.db.selectFrom("problems").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
    expect(row).toMatchObject({
      organisation_id: seed.organisations.QMH,
      site_id: seed.sites[THEATRES],
      order_id: o.orderId,
      cycle_id: o.cycles[0]!.cycleId,
      set_id: o.cycles[0]!.setId,
      kind: "damaged_instrument",
      description: "The tip of the curved Mayo scissors is bent; found when opening the tray.",
      photo_file_id: photoId,
      status: "open",
      answer: null,
      reported_by: userId("theatres@quillby.example"),
    });
    const audit = await t.db.selectFrom("audit_log").selectAll().where("entity", "=", "problem").where("entity_id", "=", String(id)).execute();
    expect(audit.map((a) => [a.action, a.actor_user_id, a.organisation_id])).toEqual([["problem.reported", userId("theatres@quillby.example"), seed.organisations.QMH]]);

    // The clinic sees the set, its contents and the photo, not the unit's scan history.
    const own = await getProblem("theatres@quillby.example", id);
    expect(own.status).toBe(200);
    expect(own.body).toMatchObject({ status: "open", set: { serial: o.cycles[0]!.serial }, order: { reference: o.reference }, photo: { id: photoId, contentType: "image/png" }, history: [] });
    expect(own.body.set.contents.length).toBeGreaterThan(0);
    // The unit sees the cycle's whole way: booked by the clinic, then each station to delivery.
    const unit = await getProblem("tech@larkmoor.example", id);
    expect(unit.status).toBe(200);
    expect(unit.body.history.map((h: { event: string }) => h.event)).toEqual(["book", ...ROUTE.map(([e]) => e)]);
    expect(unit.body.history.at(-1)).toMatchObject({ toState: "delivered", station: "van" });
    expect(unit.body.cycle).toMatchObject({ state: "delivered" });
  });

  it("takes 'something else' about the order as a whole or a set not delivered yet, but not a damaged one", async () => {
    const o = await order("manager@quillby.example", DAY_CASE, 2, 1);
    const manager = await as("manager@quillby.example");
    const whole = await reportProblem(t.db, manager, report({ orderId: o.orderId, kind: "other", description: "Two sets came without their outer dust cover." }), NOW);
    const pending = await reportProblem(t.db, manager, report({ orderId: o.orderId, cycleId: o.cycles[1]!.cycleId, kind: "other", description: "This one is needed on Friday at the latest." }), NOW);
    const rows = await t.db.selectFrom("problems").select(["id", "cycle_id", "set_id"]).where("id", "in", [whole.problemId, pending.problemId]).orderBy("id").execute();
    expect(rows.map((r) => [r.cycle_id, r.set_id])).toEqual([
      [null, null],
      [o.cycles[1]!.cycleId, o.cycles[1]!.setId],
    ]);

    const before = await countRows(t.db, [...TABLES]);
    const refused = await reportProblem(t.db, manager, report({ orderId: o.orderId, cycleId: o.cycles[1]!.cycleId, kind: "wet_or_torn_pack", description: "The wrap is torn along one side." }), NOW).catch((e) => e);
    expect(refused).toMatchObject({ code: "validation", fields: { cycleId: ["This set has not been delivered yet."] } });
    expect(refused.message).toMatch(/has not been delivered yet \(pickup booked\)/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("refuses bad input with field errors and writes nothing", async () => {
    const o = await order("theatres@quillby.example", THEATRES, 1);
    session.user = await as("theatres@quillby.example");
    const before = await countRows(t.db, [...TABLES]);
    const short = await reportProblemAction({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "missing_instrument", description: "  gone    ", photoFileId: null });
    expect(short).toMatchObject({ ok: false, error: { code: "validation" } });
    if (!short.ok) expect(short.error.fields?.description?.[0]).toMatch(/at least 10 characters/);
    const long = await reportProblemAction({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "missing_instrument", description: "x".repeat(2001), photoFileId: null });
    if (!long.ok) expect(long.error.fields?.description?.[0]).toBe("Use at most 2000 characters.");
    else expect.fail("a 2001-character description was accepted");
    const noSet = await reportProblemAction({ orderId: o.orderId, cycleId: "", kind: "wrong_set", description: "We asked for the eye tray and got this.", photoFileId: "" });
    if (!noSet.ok) expect(noSet.error.fields?.cycleId).toEqual(["Choose the set this is about."]);
    else expect.fail("a wrong-set report without a set was accepted");
    const noKind = await reportProblemAction({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "smells" as "other", description: "Something is not right here.", photoFileId: null });
    if (!noKind.ok) expect(noKind.error.fields?.kind).toEqual(["Choose what is wrong."]);
    else expect.fail("an unknown kind was accepted");
    // A file of the clinic's own that is not a problem photo (a signature image).
    const signature = await upload("theatres@quillby.example", "signature");
    const counted = await countRows(t.db, [...TABLES]);
    const wrongPurpose = await reportProblemAction({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "damaged_instrument", description: "Hinge of the retractor is loose.", photoFileId: signature });
    expect(wrongPurpose).toMatchObject({ ok: false, error: { code: "validation", fields: { photoFileId: ["Upload the photo again."] } } });
    expect(await countRows(t.db, [...TABLES])).toEqual(counted);
    expect(counted).toEqual({ ...before, files: before.files + 1 });

    // The same damage reported twice while the first is open: refused, pointing at the first.
    const first = await reportProblemAction({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "damaged_instrument", description: "Hinge of the retractor is loose.", photoFileId: null });
    expect(first.ok).toBe(true);
    const afterFirst = await countRows(t.db, [...TABLES]);
    const again = await reportProblemAction({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "damaged_instrument", description: "Hinge of the retractor is loose!", photoFileId: null });
    expect(again).toMatchObject({ ok: false, error: { code: "conflict" } });
    if (!again.ok && first.ok) expect(again.error.message).toContain(`problem ${first.data.problemId}`);
    expect(await countRows(t.db, [...TABLES])).toEqual(afterFirst);
  });
});

describe("the tenant scope", () => {
  it("answers 404 for another tenant's order, set or photo, and writes nothing", async () => {
    const qmh = await order("theatres@quillby.example", THEATRES, 1);
    const other = await order("theatres@quillby.example", THEATRES, 1);
    const ods = await order("staff@otterwick.example", OTTERWICK, 1);
    const odsPhoto = await upload("manager@otterwick.example", "problem_photo");
    const before = await countRows(t.db, [...TABLES]);
    const attempt = async (email: string, input: Record<string, unknown>) => {
      session.user = await as(email);
      return reportProblemAction({ kind: "damaged_instrument", description: "Forceps tip snapped off.", photoFileId: null, ...input } as never);
    };
    // Another organisation's order, and a sibling site's order for clinic staff.
    expect(await attempt("manager@otterwick.example", { orderId: qmh.orderId, cycleId: qmh.cycles[0]!.cycleId })).toMatchObject({ ok: false, error: { code: "not_found" } });
    expect(await attempt("daycase@quillby.example", { orderId: qmh.orderId, cycleId: qmh.cycles[0]!.cycleId })).toMatchObject({ ok: false, error: { code: "not_found" } });
    // Its own order with another tenant's set, or a set of another of its orders.
    expect(await attempt("theatres@quillby.example", { orderId: qmh.orderId, cycleId: ods.cycles[0]!.cycleId })).toMatchObject({ ok: false, error: { code: "not_found", fields: { cycleId: ["Choose one of this order's sets."] } } });
    expect(await attempt("theatres@quillby.example", { orderId: qmh.orderId, cycleId: other.cycles[0]!.cycleId })).toMatchObject({ ok: false, error: { code: "not_found" } });
    // A forged photo id: another organisation's photo.
    const forged = await attempt("theatres@quillby.example", { orderId: qmh.orderId, cycleId: qmh.cycles[0]!.cycleId, photoFileId: odsPhoto });
    expect(forged).toMatchObject({ ok: false, error: { code: "not_found", fields: { photoFileId: ["Upload the photo again."] } } });
    // The unit answers problems; it does not report them. Drivers and finance do neither.
    expect(await attempt("tech@larkmoor.example", { orderId: qmh.orderId, cycleId: qmh.cycles[0]!.cycleId })).toMatchObject({ ok: false, error: { code: "forbidden" } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    const staff = await as("theatres@quillby.example");
    const { problemId } = await reportProblem(t.db, staff, report({ orderId: qmh.orderId, cycleId: qmh.cycles[0]!.cycleId }), NOW);
    const odsProblem = await reportProblem(t.db, await as("staff@otterwick.example"), report({ orderId: ods.orderId, cycleId: ods.cycles[0]!.cycleId, kind: "wrong_set", description: "Label says arthroscopy, contents are a minor set." }), NOW);

    // GET /api/problems/:id — 404 for another organisation and for a sibling site's staff.
    for (const email of ["manager@otterwick.example", "staff@otterwick.example", "daycase@quillby.example"]) {
      const res = await getProblem(email, problemId);
      expect(res.status, email).toBe(404);
      expect(JSON.stringify(res.body)).not.toContain("needle holder");
    }
    expect((await getProblem("manager@quillby.example", problemId)).status).toBe(200);
    expect((await getProblem("quality@larkmoor.example", problemId)).status).toBe(200);
    expect((await getProblem("theatres@quillby.example", "abc")).status).toBe(404);
    expect((await getProblem("driver@larkmoor.example", problemId)).status).toBe(403);

    // GET /api/problems — each caller's own only, whatever the query names.
    const theirs = await list("manager@otterwick.example", `organisationId=${seed.organisations.QMH}&pageSize=200`);
    expect(theirs.status).toBe(200);
    expect(theirs.body.rows.length).toBe(0);
    const odsOwn = await list("manager@otterwick.example", "pageSize=200");
    expect(odsOwn.body.rows.map((r: { id: number }) => r.id)).toContain(odsProblem.problemId);
    expect(odsOwn.body.rows.map((r: { id: number }) => r.id)).not.toContain(problemId);
    expect(odsOwn.body.rows.every((r: { organisationId: number }) => r.organisationId === seed.organisations.ODS)).toBe(true);
    const dayCase = await list("daycase@quillby.example", "pageSize=200");
    expect(dayCase.body.rows.every((r: { siteName: string }) => r.siteName === DAY_CASE)).toBe(true);
    const unit = await list("dispatch@larkmoor.example", "pageSize=200");
    expect(unit.body.rows.map((r: { id: number }) => r.id)).toEqual(expect.arrayContaining([problemId, odsProblem.problemId]));
    expect((await list("driver@larkmoor.example")).status).toBe(403);
    expect((await list("tech@larkmoor.example", "sort=age")).status).toBe(422);

    // Answering: the clinic may not; the unit's answer to an unknown id is a 404.
    session.user = await as("manager@quillby.example");
    expect(await answerProblemAction({ problemId, answer: "We answered ourselves." })).toMatchObject({ ok: false, error: { code: "forbidden" } });
    session.user = await as("finance@larkmoor.example");
    expect(await answerProblemAction({ problemId, answer: "Finance cannot answer." })).toMatchObject({ ok: false, error: { code: "forbidden" } });
    session.user = await as("tech@larkmoor.example");
    expect(await answerProblemAction({ problemId: 999_999, answer: "No such problem." })).toMatchObject({ ok: false, error: { code: "not_found" } });
    expect(await t.db.selectFrom("problems").select("status").where("id", "=", problemId).executeTakeFirstOrThrow()).toEqual({ status: "open" });
  });
});

describe("answering a problem", () => {
  it("records the answer once and e-mails the clinic's people who chose it, escaped, once each", async () => {
    const o = await order("theatres@quillby.example", THEATRES, 1);
    const staff = await as("theatres@quillby.example");
    const { problemId } = await reportProblem(
      t.db,
      staff,
      report({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "missing_instrument", description: "The <b>Adson</b> forceps & its pair are missing.\nChecked twice." }),
      NOW,
    );
    // The day-case nurse (another site) and everyone at other customers must not hear of it;
    // the theatres nurse and the manager (every site) do, unless they turned the e-mail off.
    await t.db.updateTable("users").set({ mail_preferences: JSON.stringify({ problem_answered: false }) }).where("email", "=", "manager@quillby.example").execute();
    const tech = await as("tech@larkmoor.example");
    const before = await countRows(t.db, [...TABLES]);

    // Bad answers write nothing.
    session.user = tech;
    const short = await answerProblemAction({ problemId, answer: " ok  " });
    if (!short.ok) expect(short.error.fields?.answer).toEqual(["Write an answer of at least 5 characters."]);
    else expect.fail("a 2-character answer was accepted");
    const long = await answerProblemAction({ problemId, answer: "y".repeat(4001) });
    expect(long).toMatchObject({ ok: false, error: { code: "validation", fields: { answer: ["Use at most 4000 characters."] } } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    const at = new Date("2026-12-01T15:30:00Z");
    const answered = await answerProblem(t.db, tech, answerProblemSchema.parse({ problemId, answer: "Found in the washer basket <tray 4>; it goes back to you on tomorrow's van & we checked the set again." }), at);
    expect(answered).toEqual({ problemId, notified: 1 });
    const row = await t.db.selectFrom("problems").selectAll().where("id", "=", problemId).executeTakeFirstOrThrow();
    expect(row).toMatchObject({ status: "answered", answered_by: userId("tech@larkmoor.example"), answered_at: at.toISOString() });
    expect(row.answer).toMatch(/^Found in the washer basket/);
    const audit = await t.db.selectFrom("audit_log").select(["action", "actor_user_id"]).where("entity", "=", "problem").where("entity_id", "=", String(problemId)).orderBy("id").execute();
    expect(audit).toEqual([
      { action: "problem.reported", actor_user_id: userId("theatres@quillby.example") },
      { action: "problem.answered", actor_user_id: userId("tech@larkmoor.example") },
    ]);

    const mail = await t.db.selectFrom("outbox").selectAll().where("template", "=", "problem.answered").where("dedupe_key", "like", `problem:${problemId}:%`).execute();
    expect(mail.map((m) => [m.to_address, m.dedupe_key, m.organisation_id])).toEqual([
      ["theatres@quillby.example", `problem:${problemId}:answered:${userId("theatres@quillby.example")}`, seed.organisations.QMH],
    ]);
    const m = mail[0]!;
    expect(m.subject).toBe(`Problem ${problemId} answered (${o.reference}): Missing instrument`);
    expect(m.text_body).toContain("Hello Owen Tilsley,");
    expect(m.text_body).toContain("  > The <b>Adson</b> forceps & its pair are missing.\n  > Checked twice.");
    expect(m.text_body).toContain("The answer, from Sol Brackenbury on 1 Dec 2026, 15:30:");
    expect(m.text_body).toContain(`/clinic/problems/${problemId}`);
    expect(m.html_body).toContain("The &lt;b&gt;Adson&lt;/b&gt; forceps &amp; its pair are missing.<br>Checked twice.");
    expect(m.html_body).toContain("washer basket &lt;tray 4&gt;; it goes back to you on tomorrow&#39;s van &amp; we checked");
    expect(m.html_body).not.toContain("<b>Adson");
    expect(m.text_body + m.html_body).not.toMatch(/Otterwick|Marrowgate|Pellowfield/);

    // Answering twice is refused and changes nothing, and the e-mail is not queued again.
    const afterAnswer = await countRows(t.db, [...TABLES]);
    session.user = await as("quality@larkmoor.example");
    const twice = await answerProblemAction({ problemId, answer: "A second answer from the quality lead." });
    expect(twice).toMatchObject({ ok: false, error: { code: "conflict" } });
    if (!twice.ok) expect(twice.error.message).toBe("This problem has already been answered by Sol Brackenbury on 1 Dec 2026, 15:30. A problem has one answer; if the clinic needs more, they report a new problem.");
    expect(await countRows(t.db, [...TABLES])).toEqual(afterAnswer);
    expect((await t.db.selectFrom("problems").select("answer").where("id", "=", problemId).executeTakeFirstOrThrow()).answer).toMatch(/^Found in the washer basket/);

    // The clinic sees the answer on the problem and on the order's list.
    const seen = await getProblem("theatres@quillby.example", problemId);
    expect(seen.body).toMatchObject({ status: "answered", answer: { byName: "Sol Brackenbury", at: at.toISOString() } });
    const onOrder = await listOrderProblems(t.db, staff, o.orderId);
    expect(onOrder.map((p) => [p.id, p.status, p.answer?.slice(0, 26), p.answeredByName])).toEqual([[problemId, "answered", "Found in the washer basket", "Sol Brackenbury"]]);
    // Another customer's order page would list none of it.
    expect(await listOrderProblems(t.db, await as("manager@otterwick.example"), o.orderId)).toEqual([]);
    await t.db.updateTable("users").set({ mail_preferences: "{}" }).where("email", "=", "manager@quillby.example").execute();
  });

  it("mails every active person of the site and the organisation-wide managers, not disabled ones", async () => {
    const o = await order("daycase@quillby.example", DAY_CASE, 1);
    const { problemId } = await reportProblem(t.db, await as("daycase@quillby.example"), report({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "wet_or_torn_pack" }), NOW);
    const { id: disabledId } = await t.db
      .insertInto("users")
      .values({ organisation_id: seed.organisations.QMH!, site_id: seed.sites[DAY_CASE]!, email: "former@quillby.example", name: "Former Nurse", role: "clinic_staff", status: "disabled", created_at: NOW.toISOString(), updated_at: NOW.toISOString() })
      .returning("id")
      .executeTakeFirstOrThrow();
    const { notified } = await answerProblem(t.db, await as("dispatch@larkmoor.example"), { problemId, answer: "Please keep the set aside unopened; we collect and reprocess it today." }, NOW);
    expect(notified).toBe(2);
    const to = await t.db.selectFrom("outbox").select("to_address").where("dedupe_key", "like", `problem:${problemId}:%`).orderBy("to_address").execute();
    expect(to.map((r) => r.to_address)).toEqual(["daycase@quillby.example", "manager@quillby.example"]);
    await t.db.deleteFrom("users").where("id", "=", disabledId).execute();
  });
});

describe("the queue", () => {
  it("puts open problems first, oldest first, and filters by status, kind and customer on the server", async () => {
    const o = await order("staff@otterwick.example", OTTERWICK, 3);
    const ods = await as("staff@otterwick.example");
    const at = (h: number) => new Date(Date.UTC(2026, 11, 3, h));
    const newer = await reportProblem(t.db, ods, report({ orderId: o.orderId, cycleId: o.cycles[0]!.cycleId, kind: "missing_instrument" }), at(12));
    const older = await reportProblem(t.db, ods, report({ orderId: o.orderId, cycleId: o.cycles[1]!.cycleId, kind: "wrong_set" }), at(9));
    const done = await reportProblem(t.db, ods, report({ orderId: o.orderId, cycleId: o.cycles[2]!.cycleId }), at(6));
    await answerProblem(t.db, await as("admin@larkmoor.example"), { problemId: done.problemId, answer: "Replaced the blade holder." }, at(7));

    const tech = await as("tech@larkmoor.example");
    const q = (query: Record<string, string>) => listProblems(t.db, tech, listProblemsQuerySchema.parse({ organisationId: String(seed.organisations.ODS), pageSize: "100", ...query }));
    const queue = await q({});
    const ids = queue.rows.map((r) => r.id);
    // Open before answered; among the open, the oldest first.
    expect(ids.indexOf(older.problemId)).toBeLessThan(ids.indexOf(newer.problemId));
    expect(ids.indexOf(newer.problemId)).toBeLessThan(ids.indexOf(done.problemId));
    const firstAnswered = queue.rows.findIndex((r) => r.status === "answered");
    expect(queue.rows.slice(firstAnswered).every((r) => r.status === "answered")).toBe(true);
    expect(queue.rows.every((r) => r.organisationName === "Otterwick Day Surgery")).toBe(true);

    const open = await q({ status: "open" });
    expect(open.rows.every((r) => r.status === "open")).toBe(true);
    expect(open.rows.map((r) => r.id)).not.toContain(done.problemId);
    expect((await q({ kind: "wrong_set" })).rows.map((r) => r.kind)).toEqual(expect.arrayContaining(["wrong_set"]));
    expect((await q({ kind: "wrong_set" })).rows.every((r) => r.kind === "wrong_set")).toBe(true);
    // Pages do not overlap, and together they hold every row once.
    const p1 = await q({ pageSize: "2", page: "1" });
    const p2 = await q({ pageSize: "2", page: "2" });
    expect(p1.total).toBe(queue.total);
    expect([...p1.rows, ...p2.rows].map((r) => r.id)).toEqual(ids.slice(0, 4));
    // Newest first when asked; a search finds a problem by its set's serial.
    const newest = await q({ sort: "created_at", dir: "desc" });
    expect(newest.rows.map((r) => r.createdAt)).toEqual([...newest.rows.map((r) => r.createdAt)].sort().reverse());
    const serial = queue.rows.find((r) => r.id === older.problemId)!.setSerial!;
    expect((await q({ q: serial })).rows.map((r) => r.id)).toContain(older.problemId);
  });
});
