import { addHours, addMinutes } from "date-fns";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SeedResult } from "@/db/seed/demo";
import { DEMO_PASSWORD } from "@/db/seed/people";
import { loadSessionUser } from "@/lib/auth/session-user";
import { verifyCredentials } from "@/lib/auth/sign-in";
import { AppError } from "@/lib/errors";
import { inviteUserSchema } from "@/lib/users/schemas";
import { acceptInvitation, describeInvitation, inviteUser, setUserStatus } from "@/lib/users/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { sessionUser } from "../support/session";

let t: DemoDatabase;
let seed: SeedResult;
const mail = { appUrl: "http://localhost:3000", timeZone: "Europe/London" };
const TABLES = ["users", "invitations", "outbox", "audit_log"] as const;

beforeAll(async () => {
  t = await useDemoDatabase();
  seed = t.seed;
});
afterAll(() => t.cleanup());

async function expectAppError(promise: Promise<unknown>, code: AppError["code"], pattern?: RegExp) {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).code).toBe(code);
  if (pattern) expect((error as AppError).message).toMatch(pattern);
}

describe("inviting people", () => {
  it("creates an invited user, a 72-hour link and the e-mail in one go", async () => {
    const manager = await sessionUser(t.db, seed.users["manager@otterwick.example"]!);
    const now = new Date("2026-12-01T10:00:00Z");
    const input = inviteUserSchema.parse({
      name: "Iris Carrow",
      email: "Iris.Carrow@Otterwick.example",
      role: "clinic_staff",
      organisationId: seed.organisations.ODS,
      siteId: seed.sites["Hesketh Fold Treatment Rooms"],
    });
    const { userId, token } = await inviteUser(t.db, manager, input, mail, now);
    const user = await t.db.selectFrom("users").selectAll().where("id", "=", userId).executeTakeFirstOrThrow();
    expect(user).toMatchObject({ email: "iris.carrow@otterwick.example", status: "invited", password_hash: null });
    const message = await t.db.selectFrom("outbox").selectAll().where("to_address", "=", user.email).executeTakeFirstOrThrow();
    expect(message.text_body).toContain(`http://localhost:3000/accept-invite/${token}`);
    expect(message.html_body).toContain("Iris Carrow");
    expect(message.organisation_id).toBe(seed.organisations.ODS);
    const invitation = await t.db.selectFrom("invitations").selectAll().where("user_id", "=", userId).executeTakeFirstOrThrow();
    expect(invitation.expires_at).toBe(addHours(now, 72).toISOString());
    expect(invitation.token_hash).not.toContain(token);

    // The link works inside 72 hours, once.
    await expectAppError(acceptInvitation(t.db, { token, password: "a long enough phrase" }, addHours(now, 73)), "conflict", /expired/);
    await acceptInvitation(t.db, { token, password: "a long enough phrase" }, addHours(now, 71));
    await expectAppError(acceptInvitation(t.db, { token, password: "another long phrase" }, addHours(now, 71)), "conflict", /already been used/);
    await expectAppError(describeInvitation(t.db, "not-a-real-token-at-all-000000"), "not_found");
    const account = await verifyCredentials(t.db, { email: "IRIS.carrow@otterwick.example", password: "a long enough phrase" });
    expect(account.userId).toBe(userId);
  });

  it("refuses a forged organisation id from a clinic manager and writes nothing", async () => {
    const manager = await sessionUser(t.db, seed.users["manager@quillby.example"]!);
    const before = await countRows(t.db, [...TABLES]);
    await expectAppError(
      inviteUser(t.db, manager, { name: "Mallory", email: "mallory@quillby.example", role: "clinic_manager", organisationId: seed.organisations.ODS! }, mail),
      "not_found",
    );
    // A unit role in a customer organisation, or a unit organisation from a clinic manager.
    await expectAppError(
      inviteUser(t.db, manager, { name: "Mallory", email: "mallory@quillby.example", role: "admin", organisationId: seed.organisations.QMH! }, mail),
      "validation",
    );
    await expectAppError(
      inviteUser(t.db, manager, { name: "Mallory", email: "mallory@quillby.example", role: "clinic_manager", organisationId: seed.organisations.LSS! }, mail),
      "not_found",
    );
    // A site of another organisation, and clinic staff without a site.
    await expectAppError(
      inviteUser(t.db, manager, { name: "Mallory", email: "mallory@quillby.example", role: "clinic_staff", organisationId: seed.organisations.QMH!, siteId: seed.sites["Millbeck Dental"] }, mail),
      "validation",
      /site of this organisation/,
    );
    await expectAppError(
      inviteUser(t.db, manager, { name: "Mallory", email: "mallory@quillby.example", role: "clinic_staff", organisationId: seed.organisations.QMH! }, mail),
      "validation",
      /choose it/,
    );
    await expectAppError(
      inviteUser(t.db, manager, { name: "Nadia again", email: "manager@otterwick.example", role: "clinic_manager", organisationId: seed.organisations.QMH! }, mail),
      "conflict",
      /already has an account/,
    );
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("rejects bad input with field errors before anything is written", () => {
    const result = inviteUserSchema.safeParse({
      name: "",
      email: "not-an-address",
      role: "superuser",
      organisationId: "abc",
      siteId: "",
    });
    expect(result.success).toBe(false);
    const fields = new Set(result.error!.issues.map((i) => i.path.join(".")));
    expect(fields).toEqual(new Set(["name", "email", "role", "organisationId"]));
    const long = inviteUserSchema.safeParse({ name: "x".repeat(121), email: `${"a".repeat(250)}@b.example`, role: "clinic_staff", organisationId: 1 });
    expect(long.error!.issues.map((i) => i.path[0]).sort()).toEqual(["email", "name"]);
  });
});

describe("accounts and sessions", () => {
  it("ends every session when an account is switched off", async () => {
    const admin = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    const driverId = seed.users["driver2@larkmoor.example"]!;
    expect(await loadSessionUser(t.db, { userId: driverId, sessionVersion: 0 })).not.toBeNull();
    await setUserStatus(t.db, admin, { userId: driverId, status: "disabled" });
    expect(await loadSessionUser(t.db, { userId: driverId, sessionVersion: 0 })).toBeNull();
    expect(await loadSessionUser(t.db, { userId: driverId, sessionVersion: 1 })).toBeNull();
    await expectAppError(verifyCredentials(t.db, { email: "driver2@larkmoor.example", password: DEMO_PASSWORD }), "unauthenticated", /not active/);
    await setUserStatus(t.db, admin, { userId: driverId, status: "active" });
    expect(await loadSessionUser(t.db, { userId: driverId, sessionVersion: 1 })).not.toBeNull();
    await expectAppError(setUserStatus(t.db, admin, { userId: admin.id, status: "disabled" }), "conflict");
  });

  it("does not let a clinic manager switch off another organisation's user", async () => {
    const manager = await sessionUser(t.db, seed.users["manager@quillby.example"]!);
    await expectAppError(setUserStatus(t.db, manager, { userId: seed.users["staff@otterwick.example"]!, status: "disabled" }), "not_found");
  });
});

describe("sign-in throttling", () => {
  it("refuses the sixth attempt after five failures in 15 minutes, even with the right password, and says when to retry", async () => {
    const email = "tech2@larkmoor.example";
    const start = new Date("2026-12-01T09:00:00Z");
    for (let i = 0; i < 5; i++) {
      await expectAppError(verifyCredentials(t.db, { email, password: "wrong password" }, addMinutes(start, i)), "unauthenticated", /Wrong e-mail or password/);
    }
    await expectAppError(verifyCredentials(t.db, { email, password: DEMO_PASSWORD }, addMinutes(start, 5)), "throttled", /Try again after 09:15 UTC/);
    // Once the first failure is 15 minutes old, four remain in the window: the right password works.
    const account = await verifyCredentials(t.db, { email, password: DEMO_PASSWORD }, addMinutes(start, 15.5));
    expect(account.userId).toBe(seed.users[email]);
    // Success clears the count.
    const left = await t.db.selectFrom("sign_in_failures").select("id").where("email", "=", email).execute();
    expect(left).toHaveLength(0);
  });

  it("throttles unknown e-mail addresses the same way, so accounts cannot be probed", async () => {
    const email = "nobody@nowhere.example";
    const start = new Date("2026-12-01T11:00:00Z");
    for (let i = 0; i < 5; i++) await expectAppError(verifyCredentials(t.db, { email, password: "x" }, start), "unauthenticated");
    await expectAppError(verifyCredentials(t.db, { email, password: "x" }, start), "throttled");
  });
});
