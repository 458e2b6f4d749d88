import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as labelPdfRoute } from "@/app/api/sets/[id]/label.pdf/route";
import { POST as packRoute } from "@/app/api/stations/packing/pack/route";
import { POST as scanRoute } from "@/app/api/stations/packing/scan/route";
import type { SeedResult } from "@/db/seed/demo";
import type { Database } from "@/db/schema";
import { applyCycleEvent, type Station } from "@/lib/cycles/store";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { renderGs1DataMatrixSvg } from "@/lib/labels/datamatrix";
import { Gs1Error } from "@/lib/labels/gs1";
import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup, getOrderDetail } from "@/lib/orders/service";
import type { PackRequest } from "@/lib/packing/schemas";
import type { PackingSetView, PackResult } from "@/lib/packing/service";
import { getSetLabel } from "@/lib/sets/label";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { pdfText } from "../support/pdf-text";
import { params, requestAs, sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
// Tuesday 1 December 2026, 10:00 in London (GMT): the demo's contracts are in force.
const NOW = new Date("2026-12-01T10:00:00Z");
const SEEDED_AT = new Date("2026-12-01T08:00:00Z");
const THEATRES = "Quillby Moor General – Main Theatres";
const DAY_CASE = "Quillby Moor General – Day Case Unit";
const NEEDLE_HOLDER = "Needle holder, Mayo-Hegar 160 mm";
const WRITES: (keyof Database)[] = ["scan_events", "pack_records", "cycles", "audit_log", "outbox"];

interface Candidate {
  id: number;
  serial: string;
  giai: string;
  siteId: number;
}
// Wrapped sets of two Quillby Moor sites whose contents list holds exactly one Mayo-Hegar 160 mm
// needle holder, not already on their way through the unit.
let candidates: Candidate[] = [];
const used = new Set<number>();

beforeAll(async () => {
  t = await useDemoDatabase(SEEDED_AT);
  seed = t.seed;
  candidates = await t.db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("set_type_items", "set_type_items.set_type_id", "set_types.id")
    .select(["sets.id", "sets.serial", "sets.giai", "sets.home_site_id as siteId"])
    .where("sets.home_site_id", "in", [seed.sites[THEATRES]!, seed.sites[DAY_CASE]!])
    .where("sets.status", "=", "in_service")
    .where("set_types.set_class", "!=", "loaner_set")
    .where("set_types.packaging", "=", "wrap")
    .where("set_type_items.name", "=", NEEDLE_HOLDER)
    .where("set_type_items.quantity", "=", 1)
    // Sets the demo scenario already has on their way through the unit cannot be booked again.
    .where((eb) =>
      eb.not(
        eb.exists(
          eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.set_id", "=", "sets.id").where("cycles.state", "not in", ["delivered", "cancelled"]),
        ),
      ),
    )
    .orderBy("sets.serial")
    .execute();
});
afterAll(() => t.cleanup());

const user = (email: string) => seed.users[email]!;
const TECH = "tech@larkmoor.example";
const ORIGIN = "http://localhost:3000";

const ROUTE_TO: Record<"received" | "washed", [CycleEvent, Station][]> = {
  received: [
    ["collect", "van"],
    ["receive", "receiving"],
  ],
  washed: [
    ["collect", "van"],
    ["receive", "receiving"],
    ["wash_passed", "washing"],
  ],
};

/** Books `count` unused candidate sets of one site for collection and moves their cycles to `state`. */
async function prepare(count: number, state: "received" | "washed") {
  const free = candidates.filter((c) => !used.has(c.id));
  const siteId = [seed.sites[THEATRES]!, seed.sites[DAY_CASE]!].find((id) => free.filter((c) => c.siteId === id).length >= count);
  expect(siteId, "enough demo sets to book").toBeDefined();
  const sets = free.filter((c) => c.siteId === siteId).slice(0, count);
  for (const s of sets) used.add(s.id);
  const manager = await sessionUser(t.db, user("manager@quillby.example"));
  const { orderId } = await bookPickup(
    t.db,
    manager,
    bookingSchema.parse({
      siteId,
      setIds: sets.map((s) => s.id),
      extras: [],
      collectionFrom: "2026-12-02T09:00",
      collectionUntil: "2026-12-02T12:00",
      neededBackBy: "2026-12-09T17:00",
      serviceLevel: "standard",
      heavySoil: false,
      notes: "",
    }),
    NOW,
  );
  const cycles = (await getOrderDetail(t.db, manager, orderId)).cycles;
  for (const c of cycles) {
    for (const [event, station] of ROUTE_TO[state]) await applyCycleEvent(t.db, { cycleId: c.cycleId, event, station, userId: null, at: NOW });
  }
  return sets.map((s) => ({ ...s, cycleId: cycles.find((c) => c.setId === s.id)!.cycleId }));
}

async function scan(code: string, who = user(TECH)) {
  return scanRoute(await requestAs(who, "/api/stations/packing/scan", { method: "POST", body: { code }, origin: ORIGIN }), params({}));
}

async function pack(body: Partial<PackRequest> & Record<string, unknown>, who = user(TECH)) {
  return packRoute(await requestAs(who, "/api/stations/packing/pack", { method: "POST", body, origin: ORIGIN }), params({}));
}

async function view(code: string): Promise<PackingSetView> {
  const res = await scan(code);
  expect(res.status).toBe(200);
  return (await res.json()) as PackingSetView;
}

/** Every line counted as the list says, with `changes` by line name. */
function countsFor(v: PackingSetView, changes: Record<string, { counted?: number | null; damaged?: number }> = {}) {
  return v.type.items.map((item) => ({
    position: item.position,
    counted: changes[item.name] && "counted" in changes[item.name]! ? changes[item.name]!.counted! : item.quantity,
    damaged: changes[item.name]?.damaged ?? 0,
  }));
}

function packBody(v: PackingSetView, overrides: Partial<PackRequest> = {}): PackRequest {
  return {
    cycleId: v.cycle!.id,
    clientEventId: crypto.randomUUID(),
    decision: "pack",
    counts: countsFor(v),
    packaging: v.type.packaging,
    packagingReason: "",
    pouch: null,
    note: "",
    ...overrides,
  };
}

const cycleRow = (id: number) => t.db.selectFrom("cycles").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
const packRecords = (cycleId: number) => t.db.selectFrom("pack_records").selectAll().where("cycle_id", "=", cycleId).orderBy("id").execute();
const events = (cycleId: number) => t.db.selectFrom("scan_events").selectAll().where("cycle_id", "=", cycleId).orderBy("id").execute();

async function labelPdf(setId: number, query = "") {
  const res = await labelPdfRoute(await requestAs(user(TECH), `/api/sets/${setId}/label.pdf${query}`), params({ id: String(setId) }));
  expect(res.status).toBe(200);
  return pdfText(new Uint8Array(await res.arrayBuffer()));
}

describe("the demo's packing history", () => {
  it("has a packing record for every packing of the history, so an old label names its packer", async () => {
    const packs = await t.db
      .selectFrom("scan_events")
      .innerJoin("cycles", "cycles.id", "scan_events.cycle_id")
      .select(["scan_events.id", "scan_events.user_id", "scan_events.at", "scan_events.cycle_id", "cycles.set_id", "cycles.state"])
      .where("scan_events.event", "=", "pack")
      .where("scan_events.station", "=", "packing")
      .where("scan_events.at", "<=", SEEDED_AT.toISOString())
      .execute();
    expect(packs.length).toBeGreaterThan(10);
    const records = await t.db
      .selectFrom("pack_records")
      .select(["scan_event_id", "cycle_id", "packed_by", "at", "outcome", "irregularities"])
      .where("scan_event_id", "in", packs.map((p) => p.id))
      .execute();
    expect(records).toHaveLength(packs.length);
    const byEvent = new Map(records.map((r) => [r.scan_event_id, r]));
    for (const p of packs) {
      expect(byEvent.get(p.id)).toMatchObject({ cycle_id: p.cycle_id, packed_by: p.user_id, at: p.at, outcome: "packed", irregularities: "[]" });
    }
    const delivered = packs.find((p) => p.state === "delivered" && p.user_id !== null)!;
    const packer = await t.db.selectFrom("users").select("name").where("id", "=", delivered.user_id!).executeTakeFirstOrThrow();
    const label = await getSetLabel(t.db, await sessionUser(t.db, user(TECH)), delivered.set_id, { cycleId: delivered.cycle_id });
    expect(label.cycle?.packedBy).toBe(packer.name);
    expect(label.cycle?.sterilisedOn).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4}$/);
  });
});

describe("packing a washed set", () => {
  it("shows the contents list, packs it when every line matches, and its label names the packer", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    expect(v.refusal).toBeNull();
    expect(v.cycle).toMatchObject({ id: set!.cycleId, state: "washed" });
    expect(v.type.items.map((i) => i.name)).toContain(NEEDLE_HOLDER);
    expect(v.type.packaging).toBe("wrap");
    // The GS1 label scans to the same set.
    expect((await view(`(8004)${set!.giai}`)).set.id).toBe(set!.id);

    const body = packBody(v);
    const res = await pack(body);
    expect(res.status).toBe(200);
    const result = (await res.json()) as PackResult;
    expect(result).toMatchObject({ outcome: "packed", state: "packed", duplicate: false, irregularityTexts: [] });
    expect(result.labelUrl).toBe(`/unit/sets/${set!.id}/label?cycle=${set!.cycleId}`);
    expect(result.labelPdfUrl).toBe(`/api/sets/${set!.id}/label.pdf?cycle=${set!.cycleId}`);

    const cycle = await cycleRow(set!.cycleId);
    expect(cycle.state).toBe("packed");
    expect(cycle.missing_instrument).toBe(0);
    const [record] = await packRecords(set!.cycleId);
    expect(record).toMatchObject({ packed_by: user(TECH), packaging: "wrap", outcome: "packed", irregularities: "[]", packaging_reason: null });
    const counted = JSON.parse(record!.counts) as { name: string; expected: number; counted: number; damaged: number }[];
    expect(counted).toHaveLength(v.type.items.length);
    expect(counted.find((l) => l.name === NEEDLE_HOLDER)).toMatchObject({ expected: 1, counted: 1, damaged: 0 });
    const last = (await events(set!.cycleId)).at(-1)!;
    expect(last).toMatchObject({ event: "pack", from_state: "washed", to_state: "packed", station: "packing", user_id: user(TECH), client_event_id: body.clientEventId });
    expect(record!.scan_event_id).toBe(last.id);
    expect(cycle.packed_at).toBe(last.at);
    expect(record!.at).toBe(last.at);

    // The label of the current cycle: the packer, the time, the packaging; the load and dates wait.
    const tech = await sessionUser(t.db, user(TECH));
    const label = await getSetLabel(t.db, tech, set!.id);
    expect(label.cycle).toMatchObject({ cycleId: set!.cycleId, packedBy: "Sol Brackenbury", packaging: "Wrapped tray", load: null, useBy: null, irregularity: null });
    expect(label.cycle!.packedAt).toMatch(/^\d{1,2} [A-Z][a-z]{2} \d{4} \d{2}:\d{2}$/);
    expect(label.notice).toBeNull();
    const text = await labelPdf(set!.id);
    expect(text).toContain("Sol Brackenbury");
    expect(text).toContain("Wrapped tray");
    expect(text).not.toContain("IRREGULARITY");

    // Scanned again, the station shows it packed and offers its label.
    const again = await view(set!.serial);
    expect(again.refusal).toBe("Cannot pack this set: it is packed and waiting for a steriliser load.");
    expect(again.packed?.labelUrl).toBe(result.labelUrl);
  });

  it("refuses to pack a set that has not been washed, with the reason, and writes nothing", async () => {
    const [set] = await prepare(1, "received");
    const v = await view(set!.serial);
    expect(v.refusal).toBe("Cannot pack this set: it has not been washed yet.");
    const before = await countRows(t.db, WRITES);
    const res = await pack(packBody(v));
    expect(res.status).toBe(409);
    expect((await res.json()).error.message).toBe("Cannot pack this set: it has not been washed yet.");
    // Holding it from the packing station is refused the same way.
    const hold = await pack(packBody(v, { decision: "hold", note: "Stained" }));
    expect(hold.status).toBe(409);
    expect(await countRows(t.db, WRITES)).toEqual(before);
    expect((await cycleRow(set!.cycleId)).state).toBe("received");
  });
});

describe("a missing or damaged instrument", () => {
  it("is not packed as if complete; holding the set records why", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const counts = countsFor(v, { [NEEDLE_HOLDER]: { counted: 0 } });
    const before = await countRows(t.db, WRITES);
    const plain = await pack(packBody(v, { counts }));
    expect(plain.status).toBe(422);
    const body = await plain.json();
    expect(body.error.message).toBe(`1 × ${NEEDLE_HOLDER} missing. Hold the set, or pack it with the irregularity recorded on its label.`);
    expect(body.error.fields.decision).toBeTruthy();
    expect(await countRows(t.db, WRITES)).toEqual(before);

    const res = await pack(packBody(v, { counts, decision: "hold" }));
    expect(res.status).toBe(200);
    const result = (await res.json()) as PackResult;
    expect(result).toMatchObject({ outcome: "held", state: "on_hold", holdReason: `Missing: 1 × ${NEEDLE_HOLDER}`, labelUrl: null });
    const cycle = await cycleRow(set!.cycleId);
    expect(cycle).toMatchObject({ state: "on_hold", held_from: "washed", hold_reason: `Missing: 1 × ${NEEDLE_HOLDER}`, missing_instrument: 0 });
    const [record] = await packRecords(set!.cycleId);
    expect(record).toMatchObject({ outcome: "held", packed_by: user(TECH) });
    expect(JSON.parse(record!.irregularities)).toEqual([{ name: NEEDLE_HOLDER, kind: "missing", quantity: 1 }]);
    const last = (await events(set!.cycleId)).at(-1)!;
    expect(last).toMatchObject({ event: "hold", to_state: "on_hold", station: "packing" });
    expect(JSON.parse(last.details).reason).toBe(`Missing: 1 × ${NEEDLE_HOLDER}`);
    // A held set's label is not filled in, and the page says why.
    const label = await getSetLabel(t.db, await sessionUser(t.db, user(TECH)), set!.id);
    expect(label.cycle?.packedBy).toBeNull();
    expect(label.notice).toBe(`This set is on hold: Missing: 1 × ${NEEDLE_HOLDER}. Do not send it out until the hold is cleared.`);
  });

  it("can be packed with the irregularity: the cycle is flagged for the investigation and the label says so", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const res = await pack(packBody(v, { counts: countsFor(v, { [NEEDLE_HOLDER]: { counted: 0 } }), decision: "pack_with_irregularity" }));
    expect(res.status).toBe(200);
    const result = (await res.json()) as PackResult;
    expect(result).toMatchObject({ outcome: "packed", state: "packed", irregularityTexts: [`1 × ${NEEDLE_HOLDER} missing`] });
    const cycle = await cycleRow(set!.cycleId);
    expect(cycle).toMatchObject({ state: "packed", missing_instrument: 1 });
    const [record] = await packRecords(set!.cycleId);
    expect(JSON.parse(record!.irregularities)).toEqual([{ name: NEEDLE_HOLDER, kind: "missing", quantity: 1 }]);

    const label = await getSetLabel(t.db, await sessionUser(t.db, user(TECH)), set!.id, { cycleId: set!.cycleId });
    expect(label.cycle?.irregularity).toBe(`IRREGULARITY: 1 × ${NEEDLE_HOLDER} missing`);
    expect(label.cycle?.lineNotes).toEqual({ [NEEDLE_HOLDER]: "1 missing" });
    const text = await labelPdf(set!.id, `?cycle=${set!.cycleId}`);
    expect(text).toContain(`IRREGULARITY: 1 × ${NEEDLE_HOLDER} missing`);
    // With the contents list, the short line says so too.
    expect(await labelPdf(set!.id, `?contents=1&cycle=${set!.cycleId}`)).toContain(`${NEEDLE_HOLDER} — 1 missing`);
  });

  it("records a damaged instrument on the label without the missing-instrument charge", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const res = await pack(packBody(v, { counts: countsFor(v, { [NEEDLE_HOLDER]: { damaged: 1 } }), decision: "pack_with_irregularity" }));
    expect(res.status).toBe(200);
    expect((await cycleRow(set!.cycleId)).missing_instrument).toBe(0);
    const label = await getSetLabel(t.db, await sessionUser(t.db, user(TECH)), set!.id);
    expect(label.cycle?.irregularity).toBe(`IRREGULARITY: 1 × ${NEEDLE_HOLDER} damaged`);
  });
});

describe("bad input writes nothing and says what to fix", () => {
  it("wants every line counted, listing the lines not counted", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const [first, second] = v.type.items;
    const before = await countRows(t.db, WRITES);
    // A blank count is not a zero; a line left out is not counted either.
    const counts = countsFor(v, { [first!.name]: { counted: null } }).filter((c) => c.position !== second!.position);
    const res = await pack(packBody(v, { counts }));
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.error.message).toBe(`Count every line before packing. Not counted: ${first!.name}; ${second!.name}.`);
    expect(Object.keys(body.error.fields).sort()).toEqual([`line.${first!.position}`, `line.${second!.position}`].sort());

    // More than the list holds, and more damaged than counted, are refused by line.
    const over = await pack(packBody(v, { counts: countsFor(v, { [NEEDLE_HOLDER]: { counted: 2 } }) }));
    expect(over.status).toBe(422);
    expect((await over.json()).error.message).toBe(
      `2 counted of ${NEEDLE_HOLDER}, but the set holds 1: take out the extra instrument (it belongs to another set) and count again.`,
    );
    const damaged = await pack(packBody(v, { counts: countsFor(v, { [NEEDLE_HOLDER]: { counted: 0, damaged: 1 } }), decision: "hold" }));
    expect(damaged.status).toBe(422);
    // Irregularity chosen with nothing irregular; hold with no reason at all.
    expect((await pack(packBody(v, { decision: "pack_with_irregularity" }))).status).toBe(422);
    const holdNoReason = await pack(packBody(v, { decision: "hold" }));
    expect(holdNoReason.status).toBe(422);
    expect((await holdNoReason.json()).error.fields.note).toEqual(["Say why the set is held."]);
    // Not JSON; a body that does not fit the schema; an unknown cycle.
    const notJson = await packRoute(
      new (await import("next/server")).NextRequest("http://localhost:3000/api/stations/packing/pack", {
        method: "POST",
        headers: { host: "localhost:3000", origin: ORIGIN, cookie: (await requestAs(user(TECH), "/")).headers.get("cookie")!, "content-type": "application/json" },
        body: "{counts",
      }),
      params({}),
    );
    expect(notJson.status).toBe(400);
    const shape = await pack({ ...packBody(v), clientEventId: "not-a-uuid", counts: [{ position: 1, counted: -1, damaged: 0 }] });
    expect(shape.status).toBe(422);
    expect(Object.keys((await shape.json()).error.fields)).toEqual(expect.arrayContaining(["clientEventId", "counts.0.counted"]));
    expect((await pack(packBody(v, { cycleId: 999_999 }))).status).toBe(404);
    expect(await countRows(t.db, WRITES)).toEqual(before);
    expect((await cycleRow(set!.cycleId)).state).toBe("washed");
  });

  it("asks for a reason to change the packaging, and records it", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const before = await countRows(t.db, WRITES);
    const pouch = { inner: { widthMm: 250, lengthMm: 380 }, outer: { widthMm: 300, lengthMm: 450 } };
    const noReason = await pack(packBody(v, { packaging: "double_pouch", pouch }));
    expect(noReason.status).toBe(422);
    const body = await noReason.json();
    expect(body.error.message).toBe("This set type is packed in: Wrapped tray. Say why this pack is different.");
    expect(body.error.fields.packagingReason).toEqual(["Say why it is packed as double pouch this time."]);
    // A pouch that does not fit in its outer pouch, and an outer pouch for a single pouch.
    const reversed = await pack(packBody(v, { packaging: "double_pouch", packagingReason: "Wrap stock out", pouch: { inner: pouch.outer, outer: pouch.inner } }));
    expect(reversed.status).toBe(422);
    expect((await reversed.json()).error.message).toBe("A 300 × 450 mm pouch does not fit inside a 250 × 380 mm one.");
    expect((await pack(packBody(v, { packaging: "single_pouch", packagingReason: "Wrap stock out", pouch }))).status).toBe(422);
    expect((await pack(packBody(v, { pouch }))).status).toBe(422);
    expect(await countRows(t.db, WRITES)).toEqual(before);

    const res = await pack(packBody(v, { packaging: "double_pouch", packagingReason: "Wrap stock out this morning", pouch }));
    expect(res.status).toBe(200);
    const [record] = await packRecords(set!.cycleId);
    expect(record).toMatchObject({
      packaging: "double_pouch",
      packaging_reason: "Wrap stock out this morning",
      pouch: "250 × 380 mm inside 300 × 450 mm",
    });
    const details = JSON.parse((await events(set!.cycleId)).at(-1)!.details);
    expect(details).toMatchObject({ packaging: "double_pouch", packagingChangedFrom: "wrap", packagingReason: "Wrap stock out this morning" });
    expect((await getSetLabel(t.db, await sessionUser(t.db, user(TECH)), set!.id)).cycle?.packaging).toBe("Double pouch");
  });
});

describe("who may pack, and retries", () => {
  it("refuses clinic users and other unit roles without the station permission", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const before = await countRows(t.db, WRITES);
    for (const email of ["theatres@quillby.example", "manager@quillby.example", "finance@larkmoor.example", "driver@larkmoor.example"]) {
      expect((await scan(set!.serial, user(email))).status, email).toBe(403);
      expect((await pack(packBody(v), user(email))).status, email).toBe(403);
    }
    // Signed out, or from another site's page.
    expect((await packRoute(await requestAs(null, "/api/stations/packing/pack", { method: "POST", body: packBody(v), origin: ORIGIN }), params({}))).status).toBe(401);
    expect(
      (await packRoute(await requestAs(user(TECH), "/api/stations/packing/pack", { method: "POST", body: packBody(v), origin: "https://elsewhere.example" }), params({}))).status,
    ).toBe(403);
    expect(await countRows(t.db, WRITES)).toEqual(before);
    // The quality lead may pack.
    expect((await pack(packBody(v), user("quality@larkmoor.example"))).status).toBe(200);
  });

  it("records a retried request once, answering the first result", async () => {
    const [set] = await prepare(1, "washed");
    const v = await view(set!.serial);
    const body = packBody(v, { counts: countsFor(v, { [NEEDLE_HOLDER]: { counted: 0 } }), decision: "pack_with_irregularity" });
    const first = (await (await pack(body)).json()) as PackResult;
    const before = await countRows(t.db, WRITES);
    const retry = await pack(body);
    expect(retry.status).toBe(200);
    const second = (await retry.json()) as PackResult;
    expect(second.duplicate).toBe(true);
    expect(second.record.id).toBe(first.record.id);
    expect(second.state).toBe("packed");
    expect(await countRows(t.db, WRITES)).toEqual(before);
    expect((await events(set!.cycleId)).filter((e) => e.event === "pack")).toHaveLength(1);
    expect(await packRecords(set!.cycleId)).toHaveLength(1);
    // The same id for another set is a conflict, not a silent success.
    const [other] = await prepare(1, "washed");
    const otherView = await view(other!.serial);
    const reused = await pack({ ...packBody(otherView), clientEventId: body.clientEventId });
    expect(reused.status).toBe(409);
    expect((await cycleRow(other!.cycleId)).state).toBe("washed");
  });
});

describe("the label of a set and its cycles", () => {
  it("leaves the boxes blank before packing, and answers 404 for a cycle of another set", async () => {
    const [a, b] = await prepare(2, "received");
    const tech = await sessionUser(t.db, user(TECH));
    const label = await getSetLabel(t.db, tech, a!.id);
    expect(label.cycle).toMatchObject({ cycleId: a!.cycleId, packedBy: null, packedAt: null, packaging: null, irregularity: null });
    expect(label.notice).toBe("Not packed yet (received at the unit): the boxes stay blank.");
    const res = await labelPdfRoute(await requestAs(user(TECH), `/api/sets/${a!.id}/label.pdf?cycle=${b!.cycleId}`), params({ id: String(a!.id) }));
    expect(res.status).toBe(404);
    const bad = await labelPdfRoute(await requestAs(user(TECH), `/api/sets/${a!.id}/label.pdf?cycle=abc`), params({ id: String(a!.id) }));
    expect(bad.status).toBe(422);
  });

  it("keeps the expiry out of the symbol: GS1 allows (17) only with a trade item key, not with a GIAI (8004)", () => {
    // GS1 General Specifications, mandatory AI associations (as encoded in lib/labels/gs1.ts).
    const giai = candidates[0]!.giai;
    expect(() => renderGs1DataMatrixSvg([{ ai: "8004", value: giai }, { ai: "17", value: "270603" }])).toThrow(Gs1Error);
    expect(renderGs1DataMatrixSvg([{ ai: "8004", value: giai }])).toContain("<svg");
  });
});
