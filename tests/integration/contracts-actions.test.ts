import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { createContractAction, endContractAction, updateContractAction } from "@/lib/contracts/actions";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { sessionUser } from "../support/session";
import { validFormValues } from "../unit/contracts/fixtures";

// The server actions end to end below the session: the signed-in user is the one thing supplied
// here (next-auth reads it from the request's cookies, which an action called in a test has not).
const session = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/current-user", () => ({ getCurrentUser: async () => session.user }));

const TABLES = ["contracts", "contract_rates", "contract_surcharges", "audit_log"] as const;
let t: DemoDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());
beforeEach(async () => {
  session.user = await sessionUser(t.db, seed.users["finance@larkmoor.example"]!);
});

const mdpValues = (overrides: Parameters<typeof validFormValues>[0] = {}) =>
  validFormValues({ organisationId: String(seed.organisations.MDP), validFrom: "2019-01-01", validUntil: "2019-12-31", reference: "MDP-2019-01", ...overrides });

describe("contract actions", () => {
  it("returns field errors for bands that do not go up, express not quicker and a bad currency, and writes nothing", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const values = mdpValues({ currency: "XYZ", turnaround: { standardHours: "8", expressHours: "12" } });
    values.rates[2]!.bands = [
      { upToQuantity: "100", unitPrice: "20.00" },
      { upToQuantity: "100", unitPrice: "18.00" },
      { upToQuantity: "", unitPrice: "16.00" },
    ];
    const result = await createContractAction(values);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.code).toBe("validation");
    expect(Object.keys(result.error.fields ?? {}).sort()).toEqual(["currency", "rates.2.bands.1.upToQuantity", "turnaround.expressHours"]);
    expect(result.error.fields!["rates.2.bands.1.upToQuantity"]![0]).toMatch(/^Major tray \(over 25 instruments\), band 2/);
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("creates, corrects and ends a version, and answers an overlap with a conflict naming it", async () => {
    const created = await createContractAction(mdpValues());
    expect(created).toMatchObject({ ok: true });
    if (!created.ok) return;
    const id = created.data.id;
    const before = await countRows(t.db, [...TABLES]);
    const clash = await createContractAction(mdpValues({ reference: "MDP-2019-02", validFrom: "2019-12-31", validUntil: "" }));
    expect(clash).toMatchObject({ ok: false, error: { code: "conflict" } });
    if (clash.ok) return;
    expect(clash.error.message).toContain("overlap version MDP-2019-01, valid 1 January 2019 to 31 December 2019");
    expect(await countRows(t.db, [...TABLES])).toEqual(before);

    const updated = await updateContractAction({ id, values: mdpValues({ minimumMonthlyFee: "99.00" }) });
    expect(updated).toMatchObject({ ok: true, data: { id, changed: ["minimumMonthlyFeeMinor"] } });
    const ended = await endContractAction({ id, validUntil: "2019-06-30" });
    expect(ended).toMatchObject({ ok: true });
    const row = await t.db.selectFrom("contracts").select(["valid_until", "minimum_monthly_fee_minor"]).where("id", "=", id).executeTakeFirstOrThrow();
    expect(row).toEqual({ valid_until: "2019-06-30", minimum_monthly_fee_minor: 9900 });
  });

  it("refuses roles without contracts.manage", async () => {
    for (const email of ["admin@larkmoor.example", "manager@marrowgate.example"]) {
      session.user = await sessionUser(t.db, seed.users[email]!);
      const result = await createContractAction(mdpValues({ reference: "MDP-1999" , validFrom: "1999-01-01", validUntil: "1999-12-31" }));
      expect(result).toMatchObject({ ok: false, error: { code: "forbidden" } });
    }
    session.user = null;
    expect(await endContractAction({ id: 1, validUntil: "2030-01-01" })).toMatchObject({ ok: false, error: { code: "unauthenticated" } });
  });
});
