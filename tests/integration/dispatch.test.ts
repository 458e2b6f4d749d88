import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as planRoute } from "@/app/api/dispatch/[day]/route";
import { GET as manifestRoute } from "@/app/api/dispatch/[day]/manifest/[vanId]/route";
import type { SeedResult } from "@/db/seed/demo";
import { addDays } from "@/lib/dispatch/days";
import { currentSolution, lockStop, moveStop, planDay } from "@/lib/dispatch/plan";
import { expectedDeliveryAt, publishPlan } from "@/lib/dispatch/publish";
import { getDispatchDay } from "@/lib/dispatch/view";
import { saveShift } from "@/lib/dispatch/vans";
import { AppError } from "@/lib/errors";
import { notifyOrder } from "@/lib/orders/notifications";
import { validateSolution } from "@/lib/routing";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionUser } from "../support/session";

// The dispatcher's day against the demo scenario: planning, moving and locking stops,
// publishing with the expected-time e-mails, who may read a plan, and refused input.

let t: DemoDatabase;
let seed: SeedResult;
let day: string;
const DISPATCHER = "dispatch@larkmoor.example";
const PLAN_TABLES = ["route_plans", "route_runs", "route_stops", "route_stop_orders", "driver_shifts", "outbox", "audit_log"] as const;

const dispatcher = () => sessionUser(t.db, seed.users[DISPATCHER]!);

// Writing the whole demo scenario takes a while on a busy machine.
beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
  day = seed.planDay!;
}, 240_000);
afterAll(() => t.cleanup());

describe("the demo's day", () => {
  it("has vans, shifts and a draft plan for the seed's day with collections and deliveries", async () => {
    const view = await getDispatchDay(t.db, day);
    expect(view.vans.length).toBe(4);
    expect(view.shifts.length).toBe(3);
    expect(view.plan?.status).toBe("draft");
    const stops = [...view.plan!.runs.flatMap((r) => r.stops), ...view.plan!.unassigned];
    expect(stops.length).toBeGreaterThan(0);
    expect(stops.some((s) => s.kind !== "collection")).toBe(true);
  });
});

describe("planning a day", () => {
  it("gives runs that keep every rule the planner checks", async () => {
    const user = await dispatcher();
    const result = await planDay(t.db, user, { day, seed: 7 }, new Date(), 400);
    expect(result.routes).toBeGreaterThan(0);
    const { problem, solution, travel } = await currentSolution(t.db, day);
    expect(validateSolution(problem, solution, travel)).toEqual([]);
    const view = await getDispatchDay(t.db, day);
    for (const run of view.plan!.runs) {
      expect(run.soiledCarts).toBeLessThanOrEqual(run.soiledCapacity);
      expect(run.cleanCarts).toBeLessThanOrEqual(run.cleanCapacity);
      expect(run.stops.map((s) => s.position)).toEqual(run.stops.map((_, i) => i + 1));
    }
  });

  it("keeps a moved (locked) stop on its van and in its place when planning again", async () => {
    const user = await dispatcher();
    const view = await getDispatchDay(t.db, day);
    const runs = view.plan!.runs;
    const from = runs.find((r) => r.stops.length > 0)!;
    const to = runs.find((r) => r.vanId !== from.vanId)!;
    const stop = from.stops.at(-1)!;
    await moveStop(t.db, user, { stopId: stop.id, vanId: to.vanId, position: 1 });
    let moved = (await getDispatchDay(t.db, day)).plan!.runs.find((r) => r.vanId === to.vanId)!;
    expect(moved.stops[0]!.id).toBe(stop.id);
    expect(moved.stops[0]!.locked).toBe(true);

    await planDay(t.db, user, { day, seed: 99 }, new Date(), 300);
    moved = (await getDispatchDay(t.db, day)).plan!.runs.find((r) => r.vanId === to.vanId)!;
    expect(moved.stops[0]!.id).toBe(stop.id);
    expect(moved.stops[0]!.locked).toBe(true);
    const { problem, solution, travel } = await currentSolution(t.db, day);
    expect(validateSolution(problem, solution, travel)).toEqual([]);

    await lockStop(t.db, user, { stopId: stop.id, locked: false });
    expect((await t.db.selectFrom("route_stops").select("locked").where("id", "=", stop.id).executeTakeFirstOrThrow()).locked).toBe(0);
  });

  it("refuses to move a stop to a van with no shift that day, and writes nothing", async () => {
    const user = await dispatcher();
    const view = await getDispatchDay(t.db, day);
    const stop = view.plan!.runs.flatMap((r) => r.stops)[0]!;
    const before = await countRows(t.db, [...PLAN_TABLES]);
    const snapshot = await t.db.selectFrom("route_stops").selectAll().orderBy("id").execute();
    const error = await moveStop(t.db, user, { stopId: stop.id, vanId: seed.vans!.V4!, position: 1 }).catch((e: unknown) => e);
    expect(error).toBeInstanceOf(AppError);
    expect((error as AppError).status).toBe(422);
    expect((error as AppError).message).toBe(`Van V4 has no driver's shift on ${day}: add a shift with that van first, or choose another van.`);
    expect(await countRows(t.db, [...PLAN_TABLES])).toEqual(before);
    expect(await t.db.selectFrom("route_stops").selectAll().orderBy("id").execute()).toEqual(snapshot);
  });

  it("refuses a shift for someone who is not a driver", async () => {
    const user = await dispatcher();
    const before = await countRows(t.db, [...PLAN_TABLES]);
    const error = await saveShift(t.db, user, {
      day,
      userId: seed.users["tech@larkmoor.example"]!,
      vanId: seed.vans!.V4!,
      start: "08:00",
      end: "16:00",
      breakEarliest: "",
      breakLatest: "",
      breakMinutes: 0,
    }).catch((e: unknown) => e);
    expect((error as AppError).message).toBe("Choose an active driver.");
    expect(await countRows(t.db, [...PLAN_TABLES])).toEqual(before);
  });
});

describe("publishing", () => {
  it("queues one expected-time mail per contact of each site with a stop, once", async () => {
    const user = await dispatcher();
    const before = await t.db.selectFrom("outbox").select("id").where("template", "=", "route.expected_time").execute();
    expect(before).toEqual([]);
    const result = await publishPlan(t.db, user, day);
    const view = await getDispatchDay(t.db, day);
    expect(view.plan!.status).toBe("published");
    const assigned = view.plan!.runs.flatMap((r) => r.stops);
    expect(result.notifiedStops).toBe(assigned.length);
    const mails = await t.db.selectFrom("outbox").select(["to_address", "subject", "text_body", "dedupe_key"]).where("template", "=", "route.expected_time").execute();
    expect(mails.length).toBe(result.messages);
    expect(new Set(mails.map((m) => m.dedupe_key)).size).toBe(mails.length);
    // Main Theatres' staff member hears about a stop there, at the time on the plan.
    const theatres = assigned.find((s) => s.siteName === "Quillby Moor General – Main Theatres");
    if (theatres) {
      const mail = mails.find((m) => m.to_address === "theatres@quillby.example")!;
      expect(mail.text_body).toContain(`around ${theatres.start!.slice(0, 3)}`);
    }
    // No clinic hears about another clinic's visit: every recipient belongs to the stop's customer.
    const orgOf = await t.db.selectFrom("users").select(["email", "organisation_id"]).execute();
    const stopOrgs = new Set(assigned.map((s) => s.organisationName));
    expect(stopOrgs.size).toBeGreaterThan(0);
    for (const m of mails) expect(orgOf.find((u) => u.email === m.to_address)?.organisation_id).not.toBe(seed.organisations.LSS);

    // Publishing again without a change queues nothing.
    const again = await publishPlan(t.db, user, day);
    expect(again.messages).toBe(0);
    expect(await t.db.selectFrom("outbox").select("id").where("template", "=", "route.expected_time").execute()).toHaveLength(mails.length);
  });

  it("after a change, tells only the sites whose time moved", async () => {
    const user = await dispatcher();
    const view = await getDispatchDay(t.db, day);
    const run = view.plan!.runs.find((r) => r.stops.length >= 2)!;
    const last = run.stops.at(-1)!;
    // The last stop to the front of its run: its time and the times after it move.
    await moveStop(t.db, user, { stopId: last.id, vanId: run.vanId, position: 1 });
    expect((await getDispatchDay(t.db, day)).plan!.status).toBe("draft");
    const after = (await getDispatchDay(t.db, day)).plan!.runs.flatMap((r) => r.stops);
    const moved = after.filter((s) => {
      const old = view.plan!.runs.flatMap((r) => r.stops).find((o) => o.id === s.id);
      return old?.start !== s.start;
    });
    const result = await publishPlan(t.db, user, day);
    expect(result.notifiedStops).toBeGreaterThan(0);
    expect(result.notifiedStops).toBeLessThanOrEqual(moved.length);
    const updates = await t.db.selectFrom("outbox").select("subject").where("template", "=", "route.expected_time").where("subject", "like", "New time%").execute();
    expect(updates.length).toBe(result.messages);
  });

  it("tells a site whose visit it was told about when the visit comes off the runs, once", async () => {
    const user = await dispatcher();
    const view = await getDispatchDay(t.db, day);
    const stop = view.plan!.runs.flatMap((r) => r.stops).find((s) => s.orders.length > 0)!;
    const told = await t.db.selectFrom("route_stops").select("notified_start_min").where("id", "=", stop.id).executeTakeFirstOrThrow();
    expect(told.notified_start_min).not.toBeNull();
    await moveStop(t.db, user, { stopId: stop.id, vanId: null, position: 0 });
    const result = await publishPlan(t.db, user, day);
    expect(result.withdrawnStops).toBe(1);
    const mails = await t.db.selectFrom("outbox").select(["to_address", "subject", "text_body"]).where("template", "=", "route.visit_withdrawn").execute();
    expect(mails.length).toBeGreaterThan(0);
    expect(mails.every((m) => m.subject.startsWith(`The van will not come to ${stop.siteName}`))).toBe(true);
    expect(mails[0]!.text_body).toContain(stop.orders[0]!.reference);
    const users = await t.db.selectFrom("users").select(["email", "organisation_id"]).execute();
    const site = await t.db.selectFrom("sites").select("organisation_id").where("name", "=", stop.siteName).executeTakeFirstOrThrow();
    for (const m of mails) {
      const owner = users.find((u) => u.email === m.to_address);
      if (owner) expect(owner.organisation_id).toBe(site.organisation_id);
    }
    // Publishing again tells nobody twice; back on a run, the site hears its new time as a first notice.
    expect((await publishPlan(t.db, user, day)).withdrawnStops).toBe(0);
    expect(await t.db.selectFrom("outbox").select("id").where("template", "=", "route.visit_withdrawn").execute()).toHaveLength(mails.length);
    const run = view.plan!.runs.find((r) => r.stops.some((s) => s.id === stop.id))!;
    await moveStop(t.db, user, { stopId: stop.id, vanId: run.vanId, position: 1 });
    const back = await publishPlan(t.db, user, day);
    expect(back.notifiedStops).toBeGreaterThanOrEqual(1);
    expect((await t.db.selectFrom("route_stops").select("notified_start_min").where("id", "=", stop.id).executeTakeFirstOrThrow()).notified_start_min).not.toBeNull();
  });

  it("fills the out-for-delivery mail's expected time from the published plan", async () => {
    const view = await getDispatchDay(t.db, day);
    const stop = view.plan!.runs.flatMap((r) => r.stops).find((s) => s.orders.some((o) => o.role === "deliver"));
    expect(stop).toBeDefined();
    const orderId = stop!.orders.find((o) => o.role === "deliver")!.orderId;
    const expected = await expectedDeliveryAt(t.db, orderId);
    expect(expected).not.toBeNull();
    await t.db.deleteFrom("outbox").where("dedupe_key", "like", `order:${orderId}:out_for_delivery:%`).execute();
    const n = await notifyOrder(t.db, orderId, "out_for_delivery", new Date());
    const mails = await t.db.selectFrom("outbox").select("text_body").where("dedupe_key", "like", `order:${orderId}:out_for_delivery:%`).execute();
    expect(mails).toHaveLength(n);
    if (n > 0) expect(mails[0]!.text_body).toContain("Expected around");
  });
});

describe("who may read a plan", () => {
  it("answers the dispatcher, refuses clinic users and drivers, and 404s a day without a plan", async () => {
    const get = async (email: string, d: string) => (await planRoute((await requestAs(seed.users[email]!, `/api/dispatch/${d}`)) as never, params({ day: d }) as never)).status;
    expect(await get(DISPATCHER, day)).toBe(200);
    expect(await get("admin@larkmoor.example", day)).toBe(200);
    expect(await get("manager@quillby.example", day)).toBe(403);
    expect(await get("theatres@quillby.example", day)).toBe(403);
    expect(await get("driver@larkmoor.example", day)).toBe(403);
    expect(await get(DISPATCHER, addDays(day, 30))).toBe(404);
    expect(await get(DISPATCHER, "2026-02-30")).toBe(404);
  });

  it("serves a van's manifest as a PDF and refuses a clinic", async () => {
    const view = await getDispatchDay(t.db, day);
    const run = view.plan!.runs.find((r) => r.stops.length > 0)!;
    const url = `/api/dispatch/${day}/manifest/${run.vanId}`;
    const ok = await manifestRoute((await requestAs(seed.users[DISPATCHER]!, url)) as never, params({ day, vanId: String(run.vanId) }) as never);
    expect(ok.status).toBe(200);
    expect(ok.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await ok.arrayBuffer()).subarray(0, 5).toString()).toBe("%PDF-");
    const clinic = await manifestRoute((await requestAs(seed.users["manager@quillby.example"]!, url)) as never, params({ day, vanId: String(run.vanId) }) as never);
    expect(clinic.status).toBe(403);
    const none = await manifestRoute((await requestAs(seed.users[DISPATCHER]!, url)) as never, params({ day, vanId: String(seed.vans!.V4) }) as never);
    expect(none.status).toBe(404);
  });
});
