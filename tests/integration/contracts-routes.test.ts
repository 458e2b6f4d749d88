import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as getContractRoute } from "@/app/api/contracts/[id]/route";
import { GET as listContractsRoute } from "@/app/api/contracts/route";
import type { SeedResult } from "@/db/seed/demo";
import { params, requestAs } from "../support/session";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";

// The contract route handlers answer within the caller's tenant scope. The demo is seeded as of
// today, as the handlers read the unit's today for the status.

let t: DemoDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());

const user = (email: string) => seed.users[email]!;
const contractOf = (prefix: string, index = 0) =>
  Object.entries(seed.contracts!)
    .filter(([reference]) => reference.startsWith(prefix))
    .sort(([a], [b]) => a.localeCompare(b))[index]![1];

async function get(userId: number | null, id: number) {
  return getContractRoute(await requestAs(userId, `/api/contracts/${id}`), params({ id: String(id) }));
}

async function list(userId: number | null, query = "") {
  return listContractsRoute(await requestAs(userId, `/api/contracts${query}`), params({}));
}

describe("GET /api/contracts/:id", () => {
  it("gives a clinic manager its own organisation's version with its rate card", async () => {
    const res = await get(user("manager@quillby.example"), contractOf("QMH-", 1));
    expect(res.status).toBe(200);
    const body = await res.json();
    expect(body.organisationName).toBe("Quillby Moor Hospitals");
    expect(body.status).toBe("current");
    expect(body.rates).toHaveLength(7);
    expect(body.rates.find((r: { setClass: string }) => r.setClass === "basic_tray").bands[0]).toEqual({ upToQuantity: 400, unitPriceMinor: 1450 });
  });

  it("answers 404, not the record, for another organisation's version", async () => {
    const res = await get(user("manager@quillby.example"), contractOf("ODS-"));
    expect(res.status).toBe(404);
    const text = JSON.stringify(await res.json());
    expect(text).toContain("not_found");
    expect(text).not.toContain("Otterwick");
    expect(text).not.toContain("ODS-");
  });

  it("refuses clinic staff (403) and callers without a session (401), and treats a bad id as not found", async () => {
    expect((await get(user("theatres@quillby.example"), contractOf("QMH-", 1))).status).toBe(403);
    expect((await list(user("theatres@quillby.example"))).status).toBe(403);
    expect((await get(null, contractOf("QMH-", 1))).status).toBe(401);
    const bad = await getContractRoute(await requestAs(user("finance@larkmoor.example"), "/api/contracts/x"), params({ id: "1 or 1=1" }));
    expect(bad.status).toBe(404);
  });

  it("lets finance and the administrator read any customer's version", async () => {
    expect((await get(user("finance@larkmoor.example"), contractOf("ODS-"))).status).toBe(200);
    expect((await get(user("admin@larkmoor.example"), contractOf("PVC-"))).status).toBe(200);
  });
});

describe("GET /api/contracts", () => {
  it("lists only the clinic manager's organisation, even when the query names another", async () => {
    const own = await (await list(user("manager@quillby.example"), "?pageSize=100")).json();
    expect(own.total).toBe(2);
    expect(own.rows.every((r: { organisationName: string }) => r.organisationName === "Quillby Moor Hospitals")).toBe(true);
    const forged = await (await list(user("manager@quillby.example"), `?organisationId=${seed.organisations.ODS}`)).json();
    expect(forged).toEqual({ rows: [], total: 0 });
  });

  it("filters by the status derived from the unit's today and sorts on the server", async () => {
    const finance = user("finance@larkmoor.example");
    const all = await (await list(finance, "?pageSize=100&sort=valid_from&dir=desc")).json();
    expect(all.total).toBe(6);
    const froms = all.rows.map((r: { validFrom: string }) => r.validFrom);
    expect(froms).toEqual([...froms].sort().reverse());
    const upcoming = await (await list(finance, "?status=upcoming")).json();
    expect(upcoming.rows.map((r: { organisationName: string; status: string }) => [r.organisationName, r.status])).toEqual([["Otterwick Day Surgery", "upcoming"]]);
    const ended = await (await list(finance, "?status=ended&sort=status")).json();
    expect(ended.rows.map((r: { organisationName: string }) => r.organisationName)).toEqual(["Quillby Moor Hospitals"]);
    const current = await (await list(finance, "?status=current&q=dental")).json();
    expect(current.rows.map((r: { organisationName: string }) => r.organisationName)).toEqual(["Marrowgate Dental Partners"]);
  });

  it("answers 422 with the fields of a malformed query", async () => {
    const res = await list(user("finance@larkmoor.example"), "?status=someday&sort=price");
    expect(res.status).toBe(422);
    expect(Object.keys((await res.json()).error.fields).sort()).toEqual(["sort", "status"]);
  });
});
