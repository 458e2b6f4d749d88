import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { GET as getFileRoute } from "@/app/api/files/[id]/route";
import { POST as uploadRoute } from "@/app/api/files/route";
import { GET as getSetTypeRoute } from "@/app/api/set-types/[id]/route";
import { GET as listSetTypesRoute } from "@/app/api/set-types/route";
import { getDb } from "@/db";
import type { SeedResult } from "@/db/seed/demo";
import { loadSessionUser } from "@/lib/auth/session-user";
import { createSetTypeAction, setSetTypeActiveAction, updateSetTypeAction } from "@/lib/catalogue/actions";
import type { CreateSetTypeInput } from "@/lib/catalogue/schemas";
import { getSetType, type SetTypeDetail } from "@/lib/catalogue/set-types";
import { ERROR_STATUS } from "@/lib/errors";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, requestAs, sessionCookie, sessionUser } from "../support/session";

// Server actions read the caller from the next-auth session of the request; here the caller is
// chosen per test and loaded from the database exactly as a signed-in session would be.
const acting = vi.hoisted(() => ({ userId: null as number | null }));
vi.mock("@/lib/auth/current-user", async (importOriginal) => {
  const real = await importOriginal<typeof import("@/lib/auth/current-user")>();
  return {
    ...real,
    getCurrentUser: async () => (acting.userId === null ? null : loadSessionUser(getDb(), { userId: acting.userId, sessionVersion: 0 })),
  };
});

let t: DemoDatabase;
let seed: SeedResult;
const TABLES = ["set_types", "set_type_items", "audit_log"] as const;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());

const user = (email: string) => seed.users[email]!;
const setTypeId = (org: string, code: string) => seed.setTypes![org]![code]!;
const get = async (userId: number | null, id: number | string) => {
  const res = await getSetTypeRoute(await requestAs(userId, `/api/set-types/${id}`), params({ id: String(id) }));
  return { status: res.status, body: await res.json() };
};
const list = async (userId: number, query: string) => {
  const res = await listSetTypesRoute(await requestAs(userId, `/api/set-types?${query}`), params({}));
  return { status: res.status, body: await res.json() };
};

async function uploadFile(userId: number, bytes: Uint8Array, purpose: string, organisationId: number, name = "ifu.pdf"): Promise<number> {
  const form = new FormData();
  form.set("file", new File([bytes as Uint8Array<ArrayBuffer>], name));
  form.set("purpose", purpose);
  form.set("organisationId", String(organisationId));
  const headers = new Headers({ host: "localhost:3000", origin: "http://localhost:3000", cookie: await sessionCookie(userId) });
  const res = await uploadRoute(new NextRequest(new URL("/api/files", "http://localhost:3000"), { method: "POST", headers, body: form }), params({}));
  expect(res.status).toBe(200);
  return (await res.json()).id;
}
const pdf = (text: string) => new TextEncoder().encode(`%PDF-1.4\n% ${text}\n%%EOF\n`);

describe("the catalogue route handlers keep to the tenant scope", () => {
  it("answers 404, not the record, when a clinic manager asks for another organisation's set type", async () => {
    const res = await get(user("manager@quillby.example"), setTypeId("ODS", "DS-ARTH-01"));
    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe("not_found");
    expect(JSON.stringify(res.body)).not.toMatch(/arthroscopy|Otterwick/i);
  });

  it("lists only the caller's own catalogue, whatever organisation the query names", async () => {
    const res = await list(user("manager@quillby.example"), `organisationId=${seed.organisations.ODS}&pageSize=200`);
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(40);
    expect(res.body.rows.every((r: { organisationId: number }) => r.organisationId === seed.organisations.QMH)).toBe(true);
    expect(res.body.rows.some((r: { code: string }) => r.code.startsWith("DS-"))).toBe(false);
  });

  it("gives clinic staff their organisation's catalogue and a set type's contents", async () => {
    const staff = user("theatres@quillby.example");
    expect((await list(staff, "pageSize=10")).body.total).toBe(40);
    const res = await get(staff, setTypeId("QMH", "GEN-MIN-01"));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ code: "GEN-MIN-01", name: "Minor general set", weightG: 1850, sizeStu: 0.5, itemCount: 11 });
    expect(res.body.items[0]).toEqual({ position: 1, name: "Scalpel handle No. 3", quantity: 1 });
  });

  it("lets the unit's staff read any customer's catalogue, filtered and sorted on the server", async () => {
    const technician = user("tech@larkmoor.example");
    expect((await list(technician, `organisationId=${seed.organisations.ODS}`)).body.total).toBe(25);
    const loaners = await list(technician, `organisationId=${seed.organisations.QMH}&setClass=loaner_set`);
    expect(loaners.body.rows.map((r: { code: string; hasIfu: boolean }) => [r.code, r.hasIfu])).toEqual([
      ["ORTH-LN-HIP-01", true],
      ["ORTH-LN-KNEE-01", true],
      ["ORTH-LN-SPN-01", false],
    ]);
    const search = await list(technician, `organisationId=${seed.organisations.QMH}&q=arthro`);
    expect(search.body.rows.map((r: { code: string }) => r.code)).toEqual(["ORTH-ARTH-01", "ORTH-SCP-01"]);
    const low = await list(technician, `organisationId=${seed.organisations.QMH}&method=low_temperature&packaging=double_pouch`);
    expect(low.body.rows.map((r: { code: string }) => r.code)).toEqual(["LAP-SCP-01"]);
    const biggest = await list(technician, `organisationId=${seed.organisations.QMH}&sort=items&dir=desc&pageSize=3`);
    const counts = biggest.body.rows.map((r: { instrumentCount: number }) => r.instrumentCount);
    expect(counts).toEqual([...counts].sort((a: number, b: number) => b - a));
    expect(biggest.body.rows[0].code).toBe("GEN-MAJ-01");
  });

  it("does not let a clinic user read another organisation's IFU file, but does its own", async () => {
    const otherIfu = (await getSetType(t.db, await sessionUser(t.db, user("admin@larkmoor.example")), setTypeId("ODS", "DS-LN-SHV-01"))).ifu!.id;
    const ownIfu = (await getSetType(t.db, await sessionUser(t.db, user("admin@larkmoor.example")), setTypeId("QMH", "ORTH-LN-HIP-01"))).ifu!.id;
    const manager = user("manager@quillby.example");
    const other = await getFileRoute(await requestAs(manager, `/api/files/${otherIfu}`), params({ id: String(otherIfu) }));
    expect(other.status).toBe(404);
    const own = await getFileRoute(await requestAs(manager, `/api/files/${ownIfu}`), params({ id: String(ownIfu) }));
    expect(own.status).toBe(200);
    expect(own.headers.get("content-type")).toBe("application/pdf");
    expect(Buffer.from(await own.arrayBuffer()).subarray(0, 5).toString()).toBe("%PDF-");
  });

  it("flags the loaner set filed without its instructions for use", async () => {
    const admin = await sessionUser(t.db, user("admin@larkmoor.example"));
    expect((await getSetType(t.db, admin, setTypeId("QMH", "ORTH-LN-SPN-01"))).missingIfu).toBe(true);
    expect((await getSetType(t.db, admin, setTypeId("QMH", "ORTH-LN-HIP-01"))).missingIfu).toBe(false);
  });

  it("answers 401 without a session, 404 for a malformed id and 422 for a malformed filter", async () => {
    expect((await get(null, setTypeId("QMH", "GEN-MIN-01"))).status).toBe(401);
    expect((await get(user("manager@quillby.example"), "1 or 1=1")).status).toBe(404);
    const bad = await list(user("manager@quillby.example"), "setClass=bucket&sort=colour");
    expect(bad.status).toBe(422);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(["setClass", "sort"]);
  });
});

const newSetType = (overrides: Partial<CreateSetTypeInput> = {}): CreateSetTypeInput => ({
  organisationId: seed.organisations.QMH!,
  code: "gen-new-01",
  name: "New general set",
  setClass: "basic_tray",
  packaging: "wrap",
  sterilisationMethod: "steam_134",
  flags: ["ultrasonic"],
  processingNotes: "",
  weightKg: "2.35",
  sizeStu: "0.5",
  ifuFileId: null,
  items: [
    { name: "Needle holder, Mayo-Hegar 160 mm", quantity: "2" },
    { name: "Towel clip, Backhaus 110 mm", quantity: "4" },
  ],
  ...overrides,
});

describe("creating and editing set types through the server actions", () => {
  it("refuses a name or code the customer already uses with 409 and the field, writing nothing", async () => {
    acting.userId = user("admin@larkmoor.example");
    const before = await countRows(t.db, [...TABLES]);
    const byName = await createSetTypeAction(newSetType({ name: "minor GENERAL set" }));
    expect(byName.ok).toBe(false);
    if (byName.ok) return;
    expect(byName.error.code).toBe("conflict");
    expect(ERROR_STATUS.conflict).toBe(409);
    expect(byName.error.fields).toEqual({ name: ["Set type GEN-MIN-01 already has this name."] });
    const byCode = await createSetTypeAction(newSetType({ code: "gen-min-01" }));
    expect(!byCode.ok && byCode.error.fields).toEqual({ code: ["Set type GEN-MIN-01 (Minor general set) already has this code."] });
    // Another customer may use the same name and code.
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("refuses bad input with the field that needs fixing", async () => {
    acting.userId = user("admin@larkmoor.example");
    const result = await createSetTypeAction(newSetType({ weightKg: "2,35", sizeStu: "13", items: [{ name: "Clip", quantity: "-1" }] }));
    expect(!result.ok && result.error).toMatchObject({
      code: "validation",
      fields: {
        weightKg: ["Check the weight in kg: use a point as the decimal mark, e.g. 4.25."],
        sizeStu: ["A set type takes at most 12 StU; check the size."],
        "items.0.quantity": ["Enter a whole number from 1 to 999."],
      },
    });
  });

  it("refuses an IFU of another organisation, or a file that is not an IFU", async () => {
    const admin = user("admin@larkmoor.example");
    acting.userId = admin;
    const othersIfu = await uploadFile(admin, pdf("otterwick"), "ifu", seed.organisations.ODS!);
    const notAnIfu = await uploadFile(admin, new TextEncoder().encode("t_s,temp_c\n0,20\n"), "cycle_record", seed.organisations.QMH!, "record.csv");
    const before = await countRows(t.db, [...TABLES]);
    for (const ifuFileId of [othersIfu, notAnIfu, 999_999]) {
      const result = await createSetTypeAction(newSetType({ ifuFileId }));
      expect(!result.ok && result.error).toMatchObject({ code: "validation", fields: { ifuFileId: ["Upload the PDF again for this customer."] } });
    }
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("refuses clinic users and organisations that are not customers", async () => {
    acting.userId = user("manager@quillby.example");
    expect((await createSetTypeAction(newSetType())).ok).toBe(false);
    const clinic = await createSetTypeAction(newSetType());
    expect(!clinic.ok && clinic.error.code).toBe("forbidden");
    acting.userId = user("admin@larkmoor.example");
    const unit = await createSetTypeAction(newSetType({ organisationId: seed.organisations.LSS! }));
    expect(!unit.ok && unit.error.code).toBe("not_found");
    acting.userId = null;
    const nobody = await createSetTypeAction(newSetType());
    expect(!nobody.ok && nobody.error.code).toBe("unauthenticated");
  });

  it("creates a set type with its IFU and contents, edits it replacing the contents, and audits both", async () => {
    const adminId = user("admin@larkmoor.example");
    acting.userId = adminId;
    const admin = await sessionUser(t.db, adminId);
    const ifu = await uploadFile(adminId, pdf("quillby loaner"), "ifu", seed.organisations.QMH!, "loaner ifu.pdf");
    const created = await createSetTypeAction(newSetType({ setClass: "loaner_set", ifuFileId: ifu }));
    expect(created.ok).toBe(true);
    if (!created.ok) return;
    const id = created.data.id;
    let detail: SetTypeDetail = await getSetType(t.db, admin, id);
    expect(detail).toMatchObject({ code: "GEN-NEW-01", weightG: 2350, sizeStu: 0.5, flags: ["ultrasonic"], processingNotes: null, missingIfu: false });
    expect(detail.ifu).toMatchObject({ id: ifu, name: "loaner ifu.pdf" });
    expect(detail.items.map((i) => [i.position, i.name, i.quantity])).toEqual([
      [1, "Needle holder, Mayo-Hegar 160 mm", 2],
      [2, "Towel clip, Backhaus 110 mm", 4],
    ]);

    const updated = await updateSetTypeAction({
      ...newSetType({ setClass: "loaner_set", ifuFileId: ifu, name: "New general set, revised" }),
      setTypeId: id,
      items: [
        { name: "Towel clip, Backhaus 110 mm", quantity: "6" },
        { name: "Gallipot 60 ml", quantity: 1 },
      ],
    });
    expect(updated.ok && updated.data.changes).toEqual([
      "name: New general set → New general set, revised",
      "contents: 1 line added, 1 line removed, 1 count changed",
    ]);
    detail = await getSetType(t.db, admin, id);
    expect(detail.items.map((i) => [i.position, i.name, i.quantity])).toEqual([
      [1, "Towel clip, Backhaus 110 mm", 6],
      [2, "Gallipot 60 ml", 1],
    ]);
    const audit = await t.db.selectFrom("audit_log").select(["action", "actor_user_id"]).where("entity", "=", "set_type").where("entity_id", "=", String(id)).orderBy("id").execute();
    expect(audit).toEqual([
      { action: "set_type.created", actor_user_id: adminId },
      { action: "set_type.updated", actor_user_id: adminId },
    ]);

    // A failed edit (the name of another set type) leaves the set type and its contents as they were.
    const before = await countRows(t.db, [...TABLES]);
    const clash = await updateSetTypeAction({ ...newSetType({ name: "Major laparotomy set" }), setTypeId: id, items: [{ name: "Clip", quantity: 1 }] });
    expect(!clash.ok && clash.error).toMatchObject({ code: "conflict", fields: { name: ["Set type GEN-MAJ-01 already has this name."] } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
    expect((await getSetType(t.db, admin, id)).items).toEqual(detail.items);

    // Taking the IFU off a loaner set is allowed, and the set type then shows it is missing.
    const removed = await updateSetTypeAction({ ...newSetType({ setClass: "loaner_set", name: "New general set, revised", ifuFileId: null }), setTypeId: id, items: detail.items });
    expect(removed.ok && removed.data.changes).toEqual(["instructions for use removed"]);
    expect((await getSetType(t.db, admin, id)).missingIfu).toBe(true);
  });

  it("answers not found for a set type id that does not exist", async () => {
    acting.userId = user("admin@larkmoor.example");
    const result = await updateSetTypeAction({ ...newSetType(), setTypeId: 999_999 });
    expect(!result.ok && result.error.code).toBe("not_found");
  });

  it("deactivates and reactivates a set type; the list shows active ones by default", async () => {
    acting.userId = user("admin@larkmoor.example");
    const id = setTypeId("PVC", "VET-DEW-01");
    const off = await setSetTypeActiveAction({ setTypeId: id, active: false });
    expect(off.ok).toBe(true);
    const manager = user("manager@pellowfield.example");
    const active = await list(manager, "pageSize=200");
    expect(active.body.rows.some((r: { id: number }) => r.id === id)).toBe(false);
    const inactive = await list(manager, "status=inactive");
    expect(inactive.body.rows.map((r: { id: number }) => r.id)).toEqual([id]);
    expect((await get(manager, id)).body.active).toBe(false);
    const twice = await setSetTypeActiveAction({ setTypeId: id, active: false });
    expect(!twice.ok && twice.error.code).toBe("conflict");
    expect((await setSetTypeActiveAction({ setTypeId: id, active: true })).ok).toBe(true);
    const actions = await t.db.selectFrom("audit_log").select("action").where("entity_id", "=", String(id)).orderBy("id").execute();
    expect(actions.map((a) => a.action)).toEqual(["set_type.deactivated", "set_type.reactivated"]);
  });
});
