import { randomUUID } from "node:crypto";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as failRoute } from "@/app/api/loads/[id]/fail/route";
import { GET as csvRoute } from "@/app/api/recalls/[id]/report.csv/route";
import { GET as pdfRoute } from "@/app/api/recalls/[id]/report.pdf/route";
import { GET as recallRoute } from "@/app/api/recalls/[id]/route";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { applyCycleEvent } from "@/lib/cycles/store";
import { receiveScan } from "@/lib/stations/receiving";
import { recordMachineTest } from "@/lib/sterilising/machine-tests";
import { addToLoad, finishLoad, openLoad, releaseLoad, startLoad } from "@/lib/sterilising/loads";
import { failLoad, getRecall, listRecalls, type RecallView, returnRecalledSet } from "@/lib/sterilising/recalls";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { type FreeSet, freeSteamSets, makeSteriliser, packedCycle, steamCsv } from "../support/loads";
import { params, requestAs, sessionUser } from "../support/session";

// Failing a released load: every cycle in it is recalled, a recall lists its sets with the
// procedures that used them, one e-mail per affected customer is queued, and each customer sees
// only its own sets. Failing a load not yet released sends its sets back to washing instead.

let t: DemoDatabase;
let seed: SeedResult;
let free: FreeSet[] = [];
let tech: SessionUser;
let quality: SessionUser;
let machineNo = 0;
const ORIGIN = "http://localhost:3000";

function take(match: (s: FreeSet) => boolean): FreeSet {
  const index = free.findIndex(match);
  if (index < 0) throw new Error("No free demo set left for this test.");
  return free.splice(index, 1)[0]!;
}

async function releasedLoad(sets: FreeSet[], release = true) {
  machineNo += 1;
  const m = await makeSteriliser(t.db, `TC${machineNo}`, 8);
  await recordMachineTest(t.db, quality, { machineId: m.machineId, kind: "air_removal", result: "pass" });
  const load = await openLoad(t.db, tech, m);
  const cycles: number[] = [];
  for (const s of sets) {
    cycles.push(await packedCycle(t.db, s.id, tech.id));
    await addToLoad(t.db, tech, load.id, s.serial);
  }
  await startLoad(t.db, tech, load.id);
  await finishLoad(t.db, tech, load.id, { record: { fileName: "r.csv", text: steamCsv(240) }, ciType: 4, ciResult: "pass", biResult: "not_used", clientEventId: randomUUID() });
  if (release) await releaseLoad(t.db, quality, load.id, {});
  return { load, cycles };
}

async function get(route: typeof recallRoute, userId: number, url: string, id: number) {
  return route(await requestAs(userId, url), params({ id: String(id) }));
}

const QMH = () => seed.organisations["QMH"]!;
const MDP = () => seed.organisations["MDP"]!;

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
  tech = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
  quality = await sessionUser(t.db, seed.users["quality@larkmoor.example"]!);
  free = await freeSteamSets(t.db);
});
afterAll(() => t.cleanup());

describe("failing a released load", () => {
  let recallId: number;
  let sets: FreeSet[];
  let cycles: number[];

  it("recalls every cycle in it and queues one e-mail per affected customer", async () => {
    sets = [take((s) => s.organisationId === QMH() && s.sizeStu <= 0.5), take((s) => s.organisationId === QMH() && s.sizeStu <= 0.5), take((s) => s.organisationId === MDP() && s.sizeStu <= 0.5)];
    const made = await releasedLoad(sets);
    cycles = made.cycles;
    const at = new Date();
    // One set went out and was used for a procedure at the clinic.
    await applyCycleEvent(t.db, { cycleId: cycles[0]!, event: "dispatch", station: "dispatch", userId: tech.id, at });
    await applyCycleEvent(t.db, { cycleId: cycles[0]!, event: "deliver", station: "van", userId: tech.id, at });
    const c0 = await t.db.selectFrom("cycles").select(["organisation_id", "site_id", "set_id"]).where("id", "=", cycles[0]!).executeTakeFirstOrThrow();
    await t.db
      .insertInto("procedure_uses")
      .values({ organisation_id: c0.organisation_id, site_id: c0.site_id, cycle_id: cycles[0]!, set_id: c0.set_id, theatre: "Theatre 9", case_reference: "CASE-4471", pack_checked: 1, indicator_checked: 1, recorded_by: null, used_at: at.toISOString() })
      .execute();
    const mailsBefore = await t.db.selectFrom("outbox").select("id").where("template", "=", "recall").execute();

    const req = await requestAs(quality.id, `/api/loads/${made.load.id}/fail`, { method: "POST", body: { reason: "Biological indicator from this load grew after release." }, origin: ORIGIN });
    const res = await failRoute(req, params({ id: String(made.load.id) }));
    expect(res.status).toBe(200);
    recallId = ((await res.json()) as { recallId: number }).recallId;
    expect(recallId).toBeGreaterThan(0);

    const states = await t.db.selectFrom("cycles").select("state").where("id", "in", cycles).execute();
    expect(states.map((s) => s.state)).toEqual(["recalled", "recalled", "recalled"]);
    const events = await t.db.selectFrom("scan_events").select("cycle_id").where("event", "=", "recall").where("cycle_id", "in", cycles).execute();
    expect(events).toHaveLength(3);
    const items = await t.db.selectFrom("recall_items").selectAll().where("recall_id", "=", recallId).execute();
    expect(items.map((i) => i.state_at_recall).sort()).toEqual(["delivered", "released", "released"]);

    const mails = await t.db.selectFrom("outbox").selectAll().where("template", "=", "recall").execute();
    const fresh = mails.filter((m) => !mailsBefore.some((b) => b.id === m.id));
    expect(fresh.map((m) => m.organisation_id).sort()).toEqual([QMH(), MDP()].sort());
    const qmhMail = fresh.find((m) => m.organisation_id === QMH())!;
    expect(qmhMail.to_address).toContain("manager@quillby.example");
    expect(qmhMail.text_body).toContain(sets[0]!.serial);
    expect(qmhMail.text_body).not.toContain(sets[2]!.serial);
    const load = await t.db.selectFrom("steriliser_loads").select(["status", "failed_after_release"]).where("id", "=", made.load.id).executeTakeFirstOrThrow();
    expect(load).toEqual({ status: "failed", failed_after_release: 1 });
  });

  it("lists the sets, where they are, and the procedures that used them", async () => {
    const recall = await getRecall(t.db, quality, recallId);
    expect(recall.items).toHaveLength(3);
    const used = recall.items.find((i) => i.serial === sets[0]!.serial)!;
    expect(used.procedures).toEqual([expect.objectContaining({ theatre: "Theatre 9", caseReference: "CASE-4471" })]);
    expect(recall.customers.map((c) => c.organisationId).sort()).toEqual([QMH(), MDP()].sort());
  });

  it("shows a clinic only its own sets, and another tenant's recall answers 404", async () => {
    const quillby = seed.users["manager@quillby.example"]!;
    const res = await get(recallRoute, quillby, `/api/recalls/${recallId}`, recallId);
    expect(res.status).toBe(200);
    const body = (await res.json()) as { recall: RecallView };
    expect(body.recall.items.map((i) => i.serial).sort()).toEqual([sets[0]!.serial, sets[1]!.serial].sort());
    expect(body.recall.items.every((i) => i.organisationId === QMH())).toBe(true);

    const otterwick = seed.users["manager@otterwick.example"]!;
    expect((await get(recallRoute, otterwick, `/api/recalls/${recallId}`, recallId)).status).toBe(404);
    expect((await get(csvRoute, otterwick, `/api/recalls/${recallId}/report.csv`, recallId)).status).toBe(404);
    const otherUser = await sessionUser(t.db, otterwick);
    expect(await listRecalls(t.db, otherUser)).toEqual([]);
    const mine = await listRecalls(t.db, await sessionUser(t.db, quillby));
    expect(mine.find((r) => r.id === recallId)?.sets).toBe(2);
  });

  it("exports the report as CSV with formula-looking cells made safe, and as PDF", async () => {
    await t.db.updateTable("procedure_uses").set({ theatre: "=HYPERLINK(1)" }).where("cycle_id", "=", cycles[0]!).execute();
    const res = await get(csvRoute, quality.id, `/api/recalls/${recallId}/report.csv`, recallId);
    expect(res.status).toBe(200);
    const parsed = Papa.parse<string[]>((await res.text()).replace(/^\uFEFF/, ""), { skipEmptyLines: true });
    expect(parsed.data[0]).toContain("procedure_case");
    expect(parsed.data.length).toBe(4);
    expect(parsed.data.some((r) => r.includes("'=HYPERLINK(1)"))).toBe(true);
    const pdf = await get(pdfRoute, quality.id, `/api/recalls/${recallId}/report.pdf`, recallId);
    expect(pdf.status).toBe(200);
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe("%PDF-");
  });

  it("counts a recalled set scanned in at receiving as back, and says which recall it was", async () => {
    const recall = await t.db.selectFrom("recalls").select("number").where("id", "=", recallId).executeTakeFirstOrThrow();
    const answer = await receiveScan(t.db, tech, { code: sets[2]!.serial, clientEventId: randomUUID() });
    expect(answer).toMatchObject({ outcome: "returned", cycle: { state: "reprocess" } });
    expect(answer.warnings).toEqual([expect.stringContaining(`Recall ${recall.number}`)]);
    const item = await t.db.selectFrom("recall_items").select(["returned_at", "returned_by"]).where("recall_id", "=", recallId).where("cycle_id", "=", cycles[2]!).executeTakeFirstOrThrow();
    expect(item.returned_by).toBe(tech.id);
    expect(item.returned_at).not.toBeNull();
    expect((await listRecalls(t.db, quality)).find((r) => r.id === recallId)?.outstanding).toBe(2);
  });

  it("tracks each set until it is back, then closes the recall", async () => {
    await expect(returnRecalledSet(t.db, quality, recallId, cycles[2]!)).rejects.toThrow(/already recorded as back/);
    for (const cycleId of cycles.slice(0, 2)) await returnRecalledSet(t.db, quality, recallId, cycleId);
    const states = await t.db.selectFrom("cycles").select("state").where("id", "in", cycles).execute();
    expect(states.every((s) => s.state === "reprocess")).toBe(true);
    const recall = await t.db.selectFrom("recalls").select("status").where("id", "=", recallId).executeTakeFirstOrThrow();
    expect(recall.status).toBe("closed");
    await expect(returnRecalledSet(t.db, quality, recallId, cycles[0]!)).rejects.toThrow(/already recorded as back/);
  });
});

describe("failing a load before release", () => {
  it("sends its sets back to washing without a recall or e-mail", async () => {
    const s = take((x) => x.sizeStu <= 0.5);
    const { load, cycles } = await releasedLoad([s], false);
    const before = await t.db.selectFrom("outbox").select("id").execute();
    const result = await failLoad(t.db, quality, load.id, { reason: "Chamber printout shows a door-seal alarm." });
    expect(result.recallId).toBeNull();
    const c = await t.db.selectFrom("cycles").select("state").where("id", "=", cycles[0]!).executeTakeFirstOrThrow();
    expect(c.state).toBe("reprocess");
    expect(await t.db.selectFrom("outbox").select("id").execute()).toHaveLength(before.length);
  });
});
