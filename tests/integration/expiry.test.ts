import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as expiringRoute } from "@/app/api/expiring/route";
import type { SeedResult } from "@/db/seed/demo";
import { addDays, expiryPhrase, localDateOf } from "@/lib/expiry/dates";
import { sendBackForReprocessing } from "@/lib/expiry/send-back";
import { listExpiringSets } from "@/lib/expiry/service";
import { defaultPickupWindow } from "@/lib/expiry/window";
import { AppError } from "@/lib/errors";
import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup, cancelPickup, getOrderDetail } from "@/lib/orders/service";
import { recordUseSchema } from "@/lib/procedures/schemas";
import { recordProcedureUse } from "@/lib/procedures/service";
import { weeklyHours } from "@/lib/sites/opening-hours";
import type { ServiceCalendar } from "@/lib/turnaround";
import { countRows } from "../support/db";
import { deliveredCycle, freshSets } from "../support/delivered-cycles";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { requestAs, sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
// Tuesday 1 December 2026, 10:00 in London (GMT): the demo's contracts are in force.
const NOW = new Date("2026-12-01T10:00:00Z");
const TODAY = "2026-12-01";
const THEATRES = "Quillby Moor General – Main Theatres";
const DAY_CASE = "Quillby Moor General – Day Case Unit";
const EYE = "Quillby Moor Eye Centre";
const OTTERWICK = "Otterwick Day Surgery Centre";

const user = (email: string) => sessionUser(t.db, seed.users[email]!);

/** The serials of a list, with their status and days left. */
async function listed(email: string, days?: number) {
  const list = await listExpiringSets(t.db, await user(email), { now: NOW, days });
  return list.rows.map((r) => `${r.serial} ${r.status} ${r.daysLeft}`);
}

const cycles: Record<string, number> = {};
const serials: Record<string, string> = {};

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  // Only this file's sets carry an expiry date, so the lists hold exactly what it made.
  await t.db.updateTable("cycles").set({ expires_on: null }).execute();
  const theatre = await freshSets(t, THEATRES, 11, NOW);
  const names = ["past", "today", "day14", "day15", "used", "newer", "cancelledNewer", "noExpiry", "retired", "sendBack", "bookedElsewhere"];
  names.forEach((n, i) => (serials[n] = theatre[i]!.serial));
  const expiry: Record<string, string | null> = {
    past: "2026-11-20",
    today: TODAY,
    day14: "2026-12-15",
    day15: "2026-12-16",
    used: "2026-12-04",
    newer: "2026-12-04",
    cancelledNewer: "2026-12-05",
    noExpiry: null,
    retired: "2026-12-03",
    sendBack: "2026-12-08",
    bookedElsewhere: "2026-12-09",
  };
  for (const [i, n] of names.entries()) cycles[n] = await deliveredCycle(t.db, theatre[i]!.id, { expiresOn: expiry[n]! });

  const staff = await user("theatres@quillby.example");
  await recordProcedureUse(t.db, staff, recordUseSchema.parse({ code: serials.used, theatre: "Theatre 1", caseReference: "QM-1", packChecked: true, indicatorChecked: true }), NOW);
  // "newer": sent again and back again; its last trip has no expiry on record, its first is stale.
  await deliveredCycle(t.db, theatre[names.indexOf("newer")]!.id, { expiresOn: null });
  // "cancelledNewer": a pickup was booked and cancelled; the set never left.
  const booking = (setId: number) =>
    bookingSchema.parse({
      siteId: seed.sites[THEATRES],
      setIds: [setId],
      extras: [],
      collectionFrom: "2026-12-02T09:00",
      collectionUntil: "2026-12-02T12:00",
      neededBackBy: "2026-12-04T17:00",
      serviceLevel: "standard",
      heavySoil: false,
      notes: "",
    });
  const { orderId } = await bookPickup(t.db, staff, booking(theatre[names.indexOf("cancelledNewer")]!.id), NOW);
  await cancelPickup(t.db, staff, { orderId }, NOW);
  await t.db.updateTable("sets").set({ status: "retired" }).where("id", "=", theatre[names.indexOf("retired")]!.id).execute();
  await bookPickup(t.db, staff, booking(theatre[names.indexOf("bookedElsewhere")]!.id), NOW);

  const [dayCase] = await freshSets(t, DAY_CASE, 1, NOW);
  serials.dayCase = dayCase!.serial;
  cycles.dayCase = await deliveredCycle(t.db, dayCase!.id, { expiresOn: "2026-12-02" });
  const [eye] = await freshSets(t, EYE, 1, NOW);
  serials.eye = eye!.serial;
  cycles.eye = await deliveredCycle(t.db, eye!.id, { expiresOn: "2026-12-03" });
  const [otterwick] = await freshSets(t, OTTERWICK, 1, NOW);
  serials.otterwick = otterwick!.serial;
  cycles.otterwick = await deliveredCycle(t.db, otterwick!.id, { expiresOn: "2026-12-02" });
});
afterAll(() => t.cleanup());

describe("the nearing-expiry list", () => {
  it("holds delivered, unused sets expiring within 14 days or past, soonest first, in the caller's scope", async () => {
    const s = serials;
    expect(await listed("theatres@quillby.example")).toEqual([
      `${s.past} expired -11`,
      `${s.today} today 0`,
      `${s.cancelledNewer} soon 4`,
      `${s.sendBack} soon 7`,
      `${s.day14} soon 14`,
    ]);
    // The manager sees every site of the organisation; other customers see only their own.
    expect(await listed("manager@quillby.example")).toEqual([
      `${s.past} expired -11`,
      `${s.today} today 0`,
      `${s.dayCase} soon 1`,
      `${s.eye} soon 2`,
      `${s.cancelledNewer} soon 4`,
      `${s.sendBack} soon 7`,
      `${s.day14} soon 14`,
    ]);
    expect(await listed("daycase@quillby.example")).toEqual([`${s.dayCase} soon 1`]);
    expect(await listed("staff@otterwick.example")).toEqual([`${s.otterwick} soon 1`]);
    expect(await listed("manager@marrowgate.example")).toEqual([]);
  });

  it("moves its boundary with the look-ahead: 0 days is today and the past, 15 days takes in day 15", async () => {
    const s = serials;
    expect(await listed("theatres@quillby.example", 0)).toEqual([`${s.past} expired -11`, `${s.today} today 0`]);
    expect(await listed("theatres@quillby.example", 15)).toContain(`${s.day15} soon 15`);
    expect(await listed("theatres@quillby.example", 14)).not.toContain(`${s.day15} soon 15`);
    expect(expiryPhrase(-11)).toBe("Expired 11 days ago");
    expect(expiryPhrase(-1)).toBe("Expired yesterday");
    expect(expiryPhrase(1)).toBe("Expires in 1 day");
  });

  it("is served by /api/expiring for today's date, and refuses a bad look-ahead", async () => {
    const today = localDateOf(new Date(), "Europe/London");
    const [set] = await freshSets(t, THEATRES, 1, NOW);
    await deliveredCycle(t.db, set!.id, { expiresOn: addDays(today, 3) });
    const res = await expiringRoute(await requestAs(seed.users["theatres@quillby.example"]!, "/api/expiring?days=5"), { params: Promise.resolve({}) });
    expect(res.status).toBe(200);
    const body = (await res.json()) as { today: string; days: number; rows: { serial: string; daysLeft: number }[] };
    expect(body.today).toBe(today);
    expect(body.days).toBe(5);
    expect(body.rows.find((r) => r.serial === set!.serial)?.daysLeft).toBe(3);
    const other = await expiringRoute(await requestAs(seed.users["staff@otterwick.example"]!, "/api/expiring"), { params: Promise.resolve({}) });
    expect(((await other.json()) as { rows: { serial: string }[] }).rows.map((r) => r.serial)).not.toContain(set!.serial);
    for (const bad of ["abc", "91", "-1", "2.5"]) {
      const r = await expiringRoute(await requestAs(seed.users["theatres@quillby.example"]!, `/api/expiring?days=${bad}`), { params: Promise.resolve({}) });
      expect(r.status, bad).toBe(422);
    }
  });
});

describe("sending a set back for reprocessing", () => {
  it("books a pickup of the set at the site's next opening, promised by the standard turnaround", async () => {
    const staff = await user("theatres@quillby.example");
    const before = await countRows(t.db, ["orders", "outbox"]);
    const sent = await sendBackForReprocessing(t.db, staff, cycles.sendBack!, NOW);
    expect(sent.reference).toMatch(/^QMH-P\d{6}$/);
    // Main Theatres are open round the clock; the contract's service calendar runs 06:00–22:00,
    // so the window starts an hour from now (11:00) and lasts three hours.
    expect([sent.collectionFrom, sent.collectionUntil]).toEqual(["2026-12-01T11:00:00.000Z", "2026-12-01T14:00:00.000Z"]);
    const order = await getOrderDetail(t.db, staff, sent.orderId);
    expect(order).toMatchObject({ status: "booked", serviceLevel: "standard", outOfHours: false, sets: 1, siteName: THEATRES });
    expect(order.cycles.map((c) => [c.serial, c.state])).toEqual([[serials.sendBack, "booked"]]);
    // Received 15:00 (window end + 60 min transit); 24 service hours: 7 h on Tuesday to 22:00,
    // 16 h on Wednesday, 1 h on Thursday from 06:00 → Thursday 07:00. Worked by hand.
    expect(order.promisedReturnAt).toBe("2026-12-03T07:00:00.000Z");
    expect(order.neededBackBy).toBe("2026-12-03T07:00:00.000Z");
    expect(order.notes).toBe("Sent back for reprocessing: its sterile pack expires on 8 Dec 2026.");
    const after = await countRows(t.db, ["orders", "outbox"]);
    expect(after.orders).toBe(before.orders + 1);
    expect(after.outbox).toBe(before.outbox + 1); // the booking confirmation
    // Booked again, it leaves the list.
    expect(await listed("theatres@quillby.example")).not.toContain(`${serials.sendBack} soon 7`);
  });

  it("says why when the booking cannot be made, and books nothing", async () => {
    const staff = await user("theatres@quillby.example");
    const manager = await user("manager@quillby.example");
    const tables = ["orders", "cycles", "scan_events", "outbox", "audit_log"] as const;
    const before = await countRows(t.db, [...tables]);
    const refused = async (promise: Promise<unknown>, code: AppError["code"], pattern: RegExp) => {
      const error = await promise.then(() => null, (e: unknown) => e);
      expect(error).toBeInstanceOf(AppError);
      expect((error as AppError).code).toBe(code);
      expect((error as AppError).message).toMatch(pattern);
    };
    await refused(sendBackForReprocessing(t.db, staff, cycles.otterwick!, NOW), "not_found", /That set was not found/);
    await refused(sendBackForReprocessing(t.db, staff, cycles.dayCase!, NOW), "not_found", /That set was not found/);
    await refused(sendBackForReprocessing(t.db, staff, cycles.bookedElsewhere!, NOW), "conflict", /is not waiting at .*: it is pickup booked/);
    await refused(sendBackForReprocessing(t.db, staff, cycles.newer!, NOW), "conflict", /is not waiting/);
    // A site switched off cannot book: the booking checks' own reason comes back.
    await t.db.updateTable("sites").set({ active: 0 }).where("id", "=", seed.sites[EYE]!).execute();
    try {
      await refused(sendBackForReprocessing(t.db, manager, cycles.eye!, NOW), "validation", /Quillby Moor Eye Centre is switched off/);
    } finally {
      await t.db.updateTable("sites").set({ active: 1 }).where("id", "=", seed.sites[EYE]!).execute();
    }
    expect(await countRows(t.db, [...tables])).toEqual(before);
  });
});

describe("the default collection window", () => {
  const tz = "Europe/London";
  const unit: ServiceCalendar = { timeZone: tz, hours: weeklyHours(["mon", "tue", "wed", "thu", "fri", "sat"], "06:00", "22:00"), holidays: [] };
  const dental = {
    ...weeklyHours(["mon", "tue", "thu", "fri"], "08:30", "17:30"),
    wed: [
      { start: "08:30", end: "12:30" },
      { start: "13:30", end: "19:00" },
    ],
  };
  const allDay = weeklyHours(["mon", "tue", "wed", "thu", "fri", "sat", "sun"], "00:00", "24:00");
  const window = (hours: typeof dental, nowIso: string, calendar: ServiceCalendar | null = unit) => {
    const w = defaultPickupWindow({ siteHours: hours, serviceCalendar: calendar, timeZone: tz, now: new Date(nowIso) });
    return w && [w.from.toISOString(), w.until.toISOString()];
  };

  it("starts an hour from now, rounded up to the half hour, inside the site's and the unit's hours", () => {
    // Wednesday 2 December 2026 (GMT).
    expect(window(dental, "2026-12-02T09:10:00Z")).toEqual(["2026-12-02T10:30:00.000Z", "2026-12-02T12:30:00.000Z"]);
    // Too little left of the morning: the afternoon opening, three hours long.
    expect(window(dental, "2026-12-02T11:45:00Z")).toEqual(["2026-12-02T13:30:00.000Z", "2026-12-02T16:30:00.000Z"]);
    // Friday after closing: Monday morning.
    expect(window(dental, "2026-12-04T17:00:00Z")).toEqual(["2026-12-07T08:30:00.000Z", "2026-12-07T11:30:00.000Z"]);
  });

  it("prefers the unit's service hours, falls back to the site's own, and offers nothing for a closed site", () => {
    // 21:30 at a site open all night: the unit's clock is stopped until 06:00.
    expect(window(allDay, "2026-12-01T21:30:00Z")).toEqual(["2026-12-02T06:00:00.000Z", "2026-12-02T09:00:00.000Z"]);
    // Without the unit's calendar: the rest of the evening, up to midnight.
    expect(window(allDay, "2026-12-01T21:30:00Z", null)).toEqual(["2026-12-01T22:30:00.000Z", "2026-12-02T00:00:00.000Z"]);
    // Summer time: 09:00 BST is 08:00 UTC (Wednesday 1 July 2026).
    expect(window(dental, "2026-07-01T06:00:00Z")).toEqual(["2026-07-01T07:30:00.000Z", "2026-07-01T10:30:00.000Z"]);
    const closed = weeklyHours([], "08:00", "17:00");
    expect(window(closed, "2026-12-01T10:00:00Z")).toBeNull();
  });
});
