import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getSiteRoute } from "@/app/api/sites/[id]/route";
import { GET as listSitesRoute } from "@/app/api/sites/route";
import { GET as getUserRoute } from "@/app/api/users/[id]/route";
import { GET as listUsersRoute } from "@/app/api/users/route";
import type { SeedResult } from "@/db/seed/demo";
import { params, requestAs } from "../support/session";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";

let t: DemoDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());

const otherSite = () => seed.sites["Otterwick Day Surgery Centre"]!;
const ownSite = () => seed.sites["Quillby Moor General – Main Theatres"]!;
const ownOtherSite = () => seed.sites["Quillby Moor Eye Centre"]!;
const user = (email: string) => seed.users[email]!;

describe("tenant scope on the site and user route handlers", () => {
  it("answers 404, not the record, when a clinic manager asks for another organisation's site", async () => {
    const res = await getSiteRoute(await requestAs(user("manager@quillby.example"), `/api/sites/${otherSite()}`), params({ id: String(otherSite()) }));
    expect(res.status).toBe(404);
    const body = await res.json();
    expect(body.error.code).toBe("not_found");
    expect(JSON.stringify(body)).not.toContain("Otterwick");
  });

  it("gives a clinic manager its own sites", async () => {
    const res = await getSiteRoute(await requestAs(user("manager@quillby.example"), `/api/sites/${ownOtherSite()}`), params({ id: String(ownOtherSite()) }));
    expect(res.status).toBe(200);
    expect((await res.json()).name).toBe("Quillby Moor Eye Centre");
  });

  it("limits clinic staff to their own site, even within their organisation", async () => {
    const staff = user("theatres@quillby.example");
    const own = await getSiteRoute(await requestAs(staff, `/api/sites/${ownSite()}`), params({ id: String(ownSite()) }));
    expect(own.status).toBe(200);
    const sibling = await getSiteRoute(await requestAs(staff, `/api/sites/${ownOtherSite()}`), params({ id: String(ownOtherSite()) }));
    expect(sibling.status).toBe(404);
    const list = await listSitesRoute(await requestAs(staff, "/api/sites"), params({}));
    const { rows } = await list.json();
    expect(rows.map((s: { id: number }) => s.id)).toEqual([ownSite()]);
  });

  it("answers 404 when a clinic manager asks for another organisation's user", async () => {
    const target = user("manager@otterwick.example");
    const res = await getUserRoute(await requestAs(user("manager@quillby.example"), `/api/users/${target}`), params({ id: String(target) }));
    expect(res.status).toBe(404);
    expect(JSON.stringify(await res.json())).not.toContain("otterwick");
  });

  it("lists only the caller's organisation's users, even when the query names another organisation", async () => {
    const res = await listUsersRoute(
      await requestAs(user("manager@quillby.example"), `/api/users?organisationId=${seed.organisations.ODS}&pageSize=100`),
      params({}),
    );
    expect(res.status).toBe(200);
    expect((await res.json()).rows).toEqual([]);
    const own = await (await listUsersRoute(await requestAs(user("manager@quillby.example"), "/api/users?pageSize=100"), params({}))).json();
    expect(own.rows.length).toBe(3);
    expect(own.rows.every((r: { organisationId: number }) => r.organisationId === seed.organisations.QMH)).toBe(true);
  });

  it("lets the unit's administrator read any organisation's records", async () => {
    const res = await getSiteRoute(await requestAs(user("admin@larkmoor.example"), `/api/sites/${otherSite()}`), params({ id: String(otherSite()) }));
    expect(res.status).toBe(200);
    const users = await (await listUsersRoute(await requestAs(user("admin@larkmoor.example"), "/api/users?pageSize=100"), params({}))).json();
    const everyone = await t.db.selectFrom("users").select((eb) => eb.fn.countAll<number>().as("n")).executeTakeFirstOrThrow();
    expect(users.total).toBe(Number(everyone.n));
  });

  it("refuses roles without the permission (403) and callers without a session (401)", async () => {
    const staffList = await listUsersRoute(await requestAs(user("theatres@quillby.example"), "/api/users"), params({}));
    expect(staffList.status).toBe(403);
    const anonymous = await listUsersRoute(await requestAs(null, "/api/users"), params({}));
    expect(anonymous.status).toBe(401);
  });

  it("treats a malformed id as not found and a malformed filter as a validation error", async () => {
    const manager = user("manager@quillby.example");
    const bad = await getSiteRoute(await requestAs(manager, "/api/sites/1%20or%201=1"), params({ id: "1 or 1=1" }));
    expect(bad.status).toBe(404);
    const badQuery = await listUsersRoute(await requestAs(manager, "/api/users?pageSize=100000&role=pope"), params({}));
    expect(badQuery.status).toBe(422);
    const body = await badQuery.json();
    expect(Object.keys(body.error.fields).sort()).toEqual(["pageSize", "role"]);
  });

  it("ignores a session whose version was revoked", async () => {
    const manager = user("manager@quillby.example");
    const res = await listUsersRoute(await requestAs(manager, "/api/users", { sessionVersion: 7 }), params({}));
    expect(res.status).toBe(401);
  });
});
