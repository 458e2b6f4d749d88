import fs from "node:fs";
import path from "node:path";
import { NextRequest } from "next/server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { POST as checkRoute } from "@/app/api/set-types/import/check/route";
import { POST as importRoute } from "@/app/api/set-types/import/route";
import type { SeedResult } from "@/db/seed/demo";
import type { ImportOutcome, ImportPlan } from "@/lib/catalogue/import-service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { params, sessionCookie } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
const TABLES = ["set_types", "set_type_items", "files", "audit_log"] as const;
const HEADER = "code,name,set_class,packaging,method,flags,weight_kg,size_stu,notes,item,count";
const utf8 = (text: string) => new TextEncoder().encode(text);

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());

const admin = () => seed.users["admin@larkmoor.example"]!;
const otterwick = () => seed.organisations.ODS!;

async function upload(
  route: typeof checkRoute,
  bytes: Uint8Array,
  options: { userId?: number; organisationId?: number; name?: string; expectedSha256?: string; origin?: string | null } = {},
) {
  const form = new FormData();
  form.set("file", new File([bytes as Uint8Array<ArrayBuffer>], options.name ?? "catalogue.csv", { type: "text/csv" }));
  form.set("organisationId", String(options.organisationId ?? otterwick()));
  if (options.expectedSha256) form.set("expectedSha256", options.expectedSha256);
  const headers = new Headers({ host: "localhost:3000", cookie: await sessionCookie(options.userId ?? admin()) });
  if (options.origin !== null) headers.set("origin", options.origin ?? "http://localhost:3000");
  const url = route === checkRoute ? "/api/set-types/import/check" : "/api/set-types/import";
  const res = await route(new NextRequest(new URL(url, "http://localhost:3000"), { method: "POST", headers, body: form }), params({}));
  return { status: res.status, body: await res.json() };
}

const check = async (bytes: Uint8Array, options?: Parameters<typeof upload>[2]) => {
  const res = await upload(checkRoute, bytes, options);
  expect(res.status).toBe(200);
  return res.body as ImportPlan;
};

/** A line of the file for a set type and one of its instruments. */
function line(code: string, name: string, item: string, count: number | string, extra: Partial<Record<string, string>> = {}) {
  const values: Record<string, string> = {
    code,
    name,
    set_class: "basic_tray",
    packaging: "wrap",
    method: "steam_134",
    flags: "ultrasonic",
    weight_kg: "2.4",
    size_stu: "0.5",
    notes: "",
    item: item.includes(",") ? `"${item}"` : item,
    count: String(count),
    ...extra,
  };
  return HEADER.split(",").map((c) => values[c]).join(",");
}

const GOOD = [
  HEADER,
  line("IMP-EYE-01", "Imported eye set", "Colibri forceps 0.12 mm", 1),
  line("IMP-EYE-01", "Imported eye set", "Westcott scissors, curved blunt", 1),
  line("IMP-EYE-01", "Imported eye set", "Eyelid speculum, wire adjustable", 1),
  line("IMP-MIN-01", "Imported minor set", "Needle holder, Mayo-Hegar 160 mm", 2, { flags: "", weight_kg: "1.75", size_stu: "0.25" }),
  line("IMP-MIN-01", "Imported minor set", "Towel clip, Backhaus 110 mm", 4, { flags: "", weight_kg: "1.75", size_stu: "0.25" }),
  line("IMP-LN-01", "Imported loaner plating set", "Drill guide 3.5/2.5 mm", 1, { set_class: "loaner_set", packaging: "rigid_container", flags: "dismantle|lumens_to_flush", weight_kg: "6.2", size_stu: "1" }),
].join("\r\n");

/** Runs a bad file through the check and the commit: the problem is reported and nothing is written. */
async function expectRefused(bytes: Uint8Array, expected: { line: number | null; column: string | null; message: RegExp | string }) {
  const before = await countRows(t.db, [...TABLES]);
  const plan = await check(bytes);
  expect(plan.issueCount).toBeGreaterThan(0);
  expect(plan.issues).toContainEqual({
    line: expected.line,
    column: expected.column,
    message: typeof expected.message === "string" ? expected.message : expect.stringMatching(expected.message),
  });
  const commit = await upload(importRoute, bytes);
  expect(commit.status).toBe(422);
  expect(commit.body.error.message).toMatch(/nothing was imported/);
  expect(await countRows(t.db, [...TABLES])).toEqual(before);
  return plan;
}

describe("refusing bad catalogue files, writing nothing", () => {
  it("an unbalanced quote, with its line", async () => {
    const text = [HEADER, line("B-01", "Bad set", "Clip", 1), 'B-01,Bad set,basic_tray,wrap,steam_134,,2.4,0.5,,"Towel clip, Backhaus,4', line("B-01", "Bad set", "Gallipot", 1)].join("\n");
    await expectRefused(utf8(text), { line: 3, column: null, message: /quoted value is not closed/ });
  });

  it("semicolons between columns", async () => {
    const text = [HEADER.replaceAll(",", ";"), "B-01;Bad set;basic_tray;wrap;steam_134;;2,4;0,5;;Clip;1"].join("\n");
    await expectRefused(utf8(text), { line: null, column: null, message: "This file uses ';' between columns; export it with commas (CSV UTF-8, comma-delimited)." });
  });

  it("Latin-1 bytes", async () => {
    const bytes = new Uint8Array([...utf8(`${HEADER}\n${line("B-01", "Bad set", "Clip", 1)}\nB-02,Caf`), 0xe9, ...utf8(",basic_tray,wrap,steam_134,,1,1,,Clip,1\n")]);
    await expectRefused(bytes, { line: null, column: null, message: /^The file is not UTF-8 text: line 3 has the byte 0xE9/ });
  });

  it("a missing and an unknown column", async () => {
    const text = ["code,name,set_class,packaging,method,colour,weight_kg,size_stu,item", "B-01,Bad set,basic_tray,wrap,steam_134,red,1,1,Clip"].join("\n");
    const plan = await expectRefused(utf8(text), { line: 1, column: "count", message: "is missing from the header" });
    expect(plan.issues).toContainEqual({ line: 1, column: "colour", message: expect.stringMatching(/^not a column of the catalogue import/) });
  });

  it("a name used twice in the file, and conflicting lines of one set type", async () => {
    const text = [
      HEADER,
      line("B-01", "Bad set", "Clip", 1),
      line("B-02", "Bad set", "Clip", 1),
      line("B-01", "Bad set", "Gallipot", 1, { method: "steam_121" }),
    ].join("\n");
    const plan = await expectRefused(utf8(text), { line: 3, column: "name", message: /is also the name of set type B-01 \(line 2\)/ });
    expect(plan.issues).toContainEqual({ line: 4, column: "method", message: expect.stringMatching(/^differs from line 2 for set type B-01/) });
  });

  it("a negative and a non-integer count", async () => {
    const text = [HEADER, line("B-01", "Bad set", "Clip", "−2"), line("B-01", "Bad set", "Gallipot", "1.5")].join("\n");
    const plan = await expectRefused(utf8(text), { line: 2, column: "count", message: "−2 is not a positive whole number" });
    expect(plan.issues).toContainEqual({ line: 3, column: "count", message: "1.5 is not a positive whole number" });
  });

  it("an unknown set class, packaging, method and flag", async () => {
    const text = [HEADER, line("B-01", "Bad set", "Clip", 1, { set_class: "tray", packaging: "box", method: "gas", flags: "ultrasonic|polish" })].join("\n");
    const plan = await expectRefused(utf8(text), { line: 2, column: "set_class", message: /^"tray" is not a set class/ });
    expect(plan.issues.map((i) => i.column)).toEqual(["set_class", "packaging", "method", "flags"]);
  });

  it("an empty file and a file of more than 5,000 lines", async () => {
    await expectRefused(utf8(""), { line: null, column: null, message: /^The file is empty/ });
    const many = [HEADER, ...Array.from({ length: 5001 }, (_, i) => line(`M-${i}`, `Many ${i}`, "Clip", 1))].join("\n");
    await expectRefused(utf8(many), { line: null, column: null, message: /has 5,001 lines of contents; import at most 5,000/ });
  });

  it("a file larger than 5 MB, before reading it", async () => {
    const big = new Uint8Array(5 * 1024 * 1024 + 1).fill(0x61);
    const before = await countRows(t.db, [...TABLES]);
    const res = await upload(checkRoute, big);
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/import at most 5 MB/);
    expect((await upload(importRoute, big)).status).toBe(422);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("a name another set type of the catalogue already has", async () => {
    const text = [HEADER, line("NEW-01", "Knee arthroscopy set", "Clip", 1)].join("\n");
    await expectRefused(utf8(text), {
      line: 2,
      column: "name",
      message: '"Knee arthroscopy set" is already the name of set type DS-ARTH-01 in this catalogue; choose another name or use code DS-ARTH-01',
    });
  });
});

describe("who may import, and into what", () => {
  it("refuses clinic users (403), cross-site posts (403) and organisations that are not customers (404)", async () => {
    const bytes = utf8(GOOD);
    expect((await upload(checkRoute, bytes, { userId: seed.users["manager@otterwick.example"]! })).status).toBe(403);
    expect((await upload(checkRoute, bytes, { origin: "https://elsewhere.example" })).status).toBe(403);
    expect((await upload(checkRoute, bytes, { origin: null })).status).toBe(403);
    expect((await upload(checkRoute, bytes, { organisationId: seed.organisations.LSS! })).status).toBe(404);
    expect((await upload(checkRoute, bytes, { organisationId: 999_999 })).status).toBe(404);
  });
});

describe("importing a good file", () => {
  it("checks it without writing, then imports all of it, then imports only what a changed file changes", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const existing = before.set_types;
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...utf8(GOOD)]); // a BOM is fine
    const plan = await check(bytes, { name: "otterwick-additions.csv" });
    expect(plan).toMatchObject({ organisationId: otterwick(), fileName: "otterwick-additions.csv", rowCount: 6, issueCount: 0, issues: [], notInFile: 25 });
    expect(plan.create.map((c) => [c.code, c.itemCount, c.line])).toEqual([
      ["IMP-EYE-01", 3, 2],
      ["IMP-MIN-01", 2, 5],
      ["IMP-LN-01", 1, 7],
    ]);
    expect(plan.update).toEqual([]);
    expect(plan.warnings).toEqual([{ line: 7, column: null, message: expect.stringMatching(/^IMP-LN-01 is a loaner set without instructions for use/) }]);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    // The commit refuses a file other than the one checked.
    const other = await upload(importRoute, utf8(GOOD.replace("Imported eye set", "Imported eye set B")), { expectedSha256: plan.sha256 });
    expect(other.status).toBe(409);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    const committed = await upload(importRoute, bytes, { expectedSha256: plan.sha256, name: "otterwick-additions.csv" });
    expect(committed.status).toBe(200);
    const outcome = committed.body as ImportOutcome;
    expect(outcome).toMatchObject({ created: 3, updated: 0, unchanged: 0 });
    const after = await countRows(t.db, [...TABLES]);
    expect(after.set_types).toBe(existing + 3);
    expect(after.set_type_items).toBe(before.set_type_items + 6);
    expect(after.files).toBe(before.files + 1); // the imported file is kept as the record
    expect(after.audit_log).toBe(before.audit_log + 4); // one per set type and one for the import

    const minor = await t.db
      .selectFrom("set_types")
      .selectAll()
      .where("organisation_id", "=", otterwick())
      .where("code", "=", "IMP-MIN-01")
      .executeTakeFirstOrThrow();
    expect(minor).toMatchObject({ name: "Imported minor set", weight_g: 1750, size_stu: 0.25, processing_flags: "[]", ifu_file_id: null, active: 1 });
    const items = await t.db.selectFrom("set_type_items").select(["position", "name", "quantity"]).where("set_type_id", "=", minor.id).orderBy("position").execute();
    expect(items).toEqual([
      { position: 1, name: "Needle holder, Mayo-Hegar 160 mm", quantity: 2 },
      { position: 2, name: "Towel clip, Backhaus 110 mm", quantity: 4 },
    ]);
    const record = await t.db.selectFrom("files").selectAll().where("id", "=", outcome.fileId!).executeTakeFirstOrThrow();
    expect(record).toMatchObject({ purpose: "catalogue_import", organisation_id: otterwick(), original_name: "otterwick-additions.csv", sha256: plan.sha256 });
    const eye = await t.db.selectFrom("set_types").select(["id", "updated_at"]).where("code", "=", "IMP-EYE-01").where("organisation_id", "=", otterwick()).executeTakeFirstOrThrow();

    // The same file again changes nothing.
    const again = await check(bytes);
    expect(again.create).toEqual([]);
    expect(again.unchanged.map((u) => u.code)).toEqual(["IMP-EYE-01", "IMP-MIN-01", "IMP-LN-01"]);

    // A changed file: one count and the weight of one set type, one new set type; the others stay.
    const changed = [
      HEADER,
      line("IMP-EYE-01", "Imported eye set", "Colibri forceps 0.12 mm", 1),
      line("IMP-EYE-01", "Imported eye set", "Westcott scissors, curved blunt", 1),
      line("IMP-EYE-01", "Imported eye set", "Eyelid speculum, wire adjustable", 1),
      line("IMP-MIN-01", "Imported minor set", "Needle holder, Mayo-Hegar 160 mm", 2, { flags: "", weight_kg: "1.8", size_stu: "0.25" }),
      line("IMP-MIN-01", "Imported minor set", "Towel clip, Backhaus 110 mm", 6, { flags: "", weight_kg: "1.8", size_stu: "0.25" }),
      line("IMP-MIN-01", "Imported minor set", "Gallipot 60 ml", 1, { flags: "", weight_kg: "1.8", size_stu: "0.25" }),
      line("IMP-SUT-01", "Imported suture set", "Suture scissors, straight 130 mm", 1),
    ].join("\n");
    const secondPlan = await check(utf8(changed));
    expect(secondPlan.create.map((c) => c.code)).toEqual(["IMP-SUT-01"]);
    expect(secondPlan.update).toEqual([
      {
        code: "IMP-MIN-01",
        name: "Imported minor set",
        line: 5,
        itemCount: 3,
        changes: ["weight: 1.75 kg → 1.8 kg", "contents: 1 line added, 1 count changed"],
      },
    ]);
    expect(secondPlan.unchanged.map((u) => u.code)).toEqual(["IMP-EYE-01"]);
    expect(secondPlan.notInFile).toBe(26); // the 25 seeded set types and IMP-LN-01 stay as they are

    const beforeSecond = await countRows(t.db, [...TABLES]);
    const second = await upload(importRoute, utf8(changed), { expectedSha256: secondPlan.sha256, name: "otterwick-changes.csv" });
    expect(second.status).toBe(200);
    expect(second.body).toMatchObject({ created: 1, updated: 1, unchanged: 1 });
    const afterSecond = await countRows(t.db, [...TABLES]);
    expect(afterSecond.set_types).toBe(beforeSecond.set_types + 1);
    expect(afterSecond.set_type_items).toBe(beforeSecond.set_type_items + 1 + 1);
    expect(afterSecond.audit_log).toBe(beforeSecond.audit_log + 3);

    const minorAfter = await t.db.selectFrom("set_types").selectAll().where("id", "=", minor.id).executeTakeFirstOrThrow();
    expect(minorAfter.weight_g).toBe(1800);
    const itemsAfter = await t.db.selectFrom("set_type_items").select(["name", "quantity"]).where("set_type_id", "=", minor.id).orderBy("position").execute();
    expect(itemsAfter).toEqual([
      { name: "Needle holder, Mayo-Hegar 160 mm", quantity: 2 },
      { name: "Towel clip, Backhaus 110 mm", quantity: 6 },
      { name: "Gallipot 60 ml", quantity: 1 },
    ]);
    const eyeAfter = await t.db.selectFrom("set_types").select(["updated_at"]).where("id", "=", eye.id).executeTakeFirstOrThrow();
    expect(eyeAfter.updated_at).toBe(eye.updated_at);
    const audit = await t.db
      .selectFrom("audit_log")
      .select(["action", "entity_id", "details"])
      .where("action", "=", "set_type.updated")
      .where("entity_id", "=", String(minor.id))
      .executeTakeFirstOrThrow();
    expect(JSON.parse(audit.details).changes).toEqual(["weight: 1.75 kg → 1.8 kg", "contents: 1 line added, 1 count changed"]);

    // The kept record holds exactly the bytes that were checked.
    const stored = fs.readFileSync(path.join(t.dir, "uploads", record.storage_key));
    expect(new Uint8Array(stored)).toEqual(bytes);
  });
});
