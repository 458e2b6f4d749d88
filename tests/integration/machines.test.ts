import { afterAll, beforeAll, beforeEach, describe, expect, it, vi } from "vitest";
import type { SeedResult } from "@/db/seed/demo";
import type { SessionUser } from "@/lib/auth/session-user";
import { createMachineAction, createProgramAction, updateMachineAction, updateProgramAction } from "@/lib/machines/actions";
import { programFormValues } from "@/lib/machines/schemas";
import { getMachine, listMachines } from "@/lib/machines/service";
import { openBatch } from "@/lib/washing/service";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { sessionUser } from "../support/session";

// The machine and program actions below the session: the signed-in user is supplied here, since
// next-auth reads it from cookies an action called in a test has not.
const session = vi.hoisted(() => ({ user: null as SessionUser | null }));
vi.mock("@/lib/auth/current-user", () => ({ getCurrentUser: async () => session.user }));

const TABLES = ["machines", "programs", "audit_log"] as const;
let t: DemoDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useDemoDatabase(new Date("2026-12-01T08:00:00Z"));
  seed = t.seed;
});
afterAll(() => t.cleanup());
beforeEach(async () => {
  session.user = await sessionUser(t.db, seed.users["quality@larkmoor.example"]!);
});

const machine = (overrides: Record<string, unknown> = {}) => ({
  kind: "washer" as const,
  code: "w4",
  name: "Chamber washer-disinfector 4",
  serialNumber: "LWD-26-0001",
  capacityStu: "6",
  active: true,
  ...overrides,
});

const blankRequirement = {
  minA0: "",
  a0MinTempC: "",
  minTempC: "",
  holdMinutes: "",
  cycleName: "",
  sterilisationTempC: "",
  bandWidthK: "",
  saturationToleranceK: "",
  airRemoval: "prevacuum" as const,
  minF0: "",
  setTempC: "",
  setMinutes: "",
};

describe("machines", () => {
  it("adds a machine with its code in capitals and an audit entry", async () => {
    const result = await createMachineAction(machine());
    expect(result).toMatchObject({ ok: true });
    if (!result.ok) return;
    const created = await getMachine(t.db, result.data.id);
    expect(created).toMatchObject({ kind: "washer", code: "W4", capacityStu: 6, active: true, programs: [] });
    const audit = await t.db.selectFrom("audit_log").selectAll().where("action", "=", "machine.created").where("entity_id", "=", String(created.id)).execute();
    expect(audit).toHaveLength(1);
    expect((await listMachines(t.db, { kind: "washer" })).map((m) => m.code)).toEqual(["W1", "W2", "W3", "W4"]);
  });

  it("returns field errors for a bad code, an impossible capacity and a missing name, and writes nothing", async () => {
    const before = await countRows(t.db, [...TABLES]);
    const result = await createMachineAction(machine({ code: "W 5!", capacityStu: "-2", name: "" }));
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.error.code).toBe("validation");
    expect(Object.keys(result.error.fields ?? {}).sort()).toEqual(["capacityStu", "code", "name"]);
    expect(result.error.fields!.code![0]).toBe("Use capital letters, digits and single dashes, e.g. W3 or A0-3000.");
    expect(result.error.fields!.capacityStu![0]).toBe("The capacity is more than 0 and at most 100 StU.");
    const taken = await createMachineAction(machine({ code: "S1" }));
    expect(taken).toMatchObject({ ok: false, error: { code: "conflict", fields: { code: ["Already used by another machine."] } } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("keeps a washer with an open batch switched on, and a machine with programs of its kind", async () => {
    const w2 = seed.machines!.W2!;
    const quality = session.user!;
    const batch = await openBatch(t.db, quality, { machineId: w2, programId: seed.programs!["W2/A0-600"]! });
    const off = await updateMachineAction({ ...machine({ code: "W2", name: "Chamber washer-disinfector 2", active: false }), id: w2 });
    expect(off).toMatchObject({ ok: false, error: { code: "conflict" } });
    if (off.ok) return;
    expect(off.error.message).toContain(`Batch ${batch.number} is loading on W2`);
    const kind = await updateMachineAction({ ...machine({ code: "W2", kind: "steriliser" }), id: w2 });
    expect(kind).toMatchObject({ ok: false, error: { code: "validation", fields: { kind: ["A machine with programs keeps its kind; add a new machine instead."] } } });
    // A program in use keeps its requirement while the batch is open.
    const inUse = await updateProgramAction({
      id: seed.programs!["W2/A0-600"]!,
      code: "A0-600",
      name: "Instruments A0 600",
      active: true,
      requirementKind: "a0",
      ...blankRequirement,
      minA0: "900",
    });
    expect(inUse).toMatchObject({ ok: false, error: { code: "conflict" } });
    const renamed = await updateMachineAction({ ...machine({ code: "W2", name: "Chamber washer 2 (left)", serialNumber: "" }), id: w2 });
    expect(renamed).toMatchObject({ ok: true });
    expect(await getMachine(t.db, w2)).toMatchObject({ name: "Chamber washer 2 (left)", serialNumber: null, openRun: { kind: "batch", number: batch.number } });
  });

  it("refuses a technician (machines.view only) and clinic users", async () => {
    session.user = await sessionUser(t.db, seed.users["tech@larkmoor.example"]!);
    expect(await createMachineAction(machine({ code: "W9" }))).toMatchObject({ ok: false, error: { code: "forbidden" } });
    session.user = await sessionUser(t.db, seed.users["manager@quillby.example"]!);
    expect(await createMachineAction(machine({ code: "W9" }))).toMatchObject({ ok: false, error: { code: "forbidden" } });
    session.user = await sessionUser(t.db, seed.users["admin@larkmoor.example"]!);
    expect(await createMachineAction(machine({ code: "W9" }))).toMatchObject({ ok: true });
  });
});

describe("programs", () => {
  it("adds washer programs with an A0 class or a temperature held for a time", async () => {
    const w1 = seed.machines!.W1!;
    const a0 = await createProgramAction({ machineId: w1, code: "a0-60", name: "Bedpans A0 60", active: true, requirementKind: "a0", ...blankRequirement, minA0: "60" });
    expect(a0).toMatchObject({ ok: true });
    const timed = await createProgramAction({
      machineId: w1,
      code: "T90-1",
      name: "Thermal 90 °C 1 min",
      active: true,
      requirementKind: "time_temp",
      ...blankRequirement,
      minTempC: "90",
      holdMinutes: "1",
    });
    expect(timed).toMatchObject({ ok: true });
    const programs = (await getMachine(t.db, w1)).programs;
    expect(programs.find((p) => p.code === "A0-60")).toMatchObject({ requirement: { kind: "a0", minA0: 60 }, requirementText: "A0 ≥ 60 (EN ISO 15883-3)" });
    expect(programs.find((p) => p.code === "T90-1")).toMatchObject({
      requirement: { kind: "time_temp", minTempC: 90, minHoldSeconds: 60 },
      requirementText: "90 °C held for 1 min",
    });
  });

  it("puts requirement problems under their fields and refuses a requirement of another kind of machine", async () => {
    const w1 = seed.machines!.W1!;
    const before = await countRows(t.db, [...TABLES]);
    const missing = await createProgramAction({ machineId: w1, code: "X1", name: "Broken", active: true, requirementKind: "time_temp", ...blankRequirement, minTempC: "50" });
    expect(missing.ok).toBe(false);
    if (missing.ok) return;
    expect(missing.error.fields).toEqual({
      minTempC: ["At least 65 °C for thermal disinfection."],
      holdMinutes: ["Enter how long the temperature must be held."],
    });
    const steamOnWasher = await createProgramAction({
      machineId: w1,
      code: "P134",
      name: "Steam on a washer",
      active: true,
      requirementKind: "steam",
      ...blankRequirement,
      cycleName: "134 °C",
      sterilisationTempC: "134",
      bandWidthK: "3",
      saturationToleranceK: "2",
      holdMinutes: "3",
    });
    expect(steamOnWasher).toMatchObject({ ok: false, error: { code: "validation", fields: { requirementKind: ["A washer-disinfector program needs an A0 value or a temperature held for a time."] } } });
    const duplicate = await createProgramAction({ machineId: w1, code: "A0-3000", name: "Again", active: true, requirementKind: "a0", ...blankRequirement, minA0: "3000" });
    expect(duplicate).toMatchObject({ ok: false, error: { code: "conflict" } });
    const nowhere = await createProgramAction({ machineId: 999999, code: "A1", name: "Nowhere", active: true, requirementKind: "a0", ...blankRequirement, minA0: "600" });
    expect(nowhere).toMatchObject({ ok: false, error: { code: "not_found" } });
    expect(await countRows(t.db, [...TABLES])).toEqual(before);
  });

  it("edits a steriliser's cycle type and reads it back into the form", async () => {
    const id = seed.programs!["S2/P121"]!;
    const result = await updateProgramAction({
      id,
      code: "P121",
      name: "121 °C 20 min",
      active: true,
      requirementKind: "steam",
      ...blankRequirement,
      cycleName: "121 °C, 20 min, pre-vacuum",
      sterilisationTempC: "121",
      bandWidthK: "3",
      saturationToleranceK: "2",
      holdMinutes: "20",
      airRemoval: "prevacuum",
    });
    expect(result).toMatchObject({ ok: true });
    const program = (await getMachine(t.db, seed.machines!.S2!)).programs.find((p) => p.id === id)!;
    expect(program.requirement).toEqual({
      kind: "steam",
      name: "121 °C, 20 min, pre-vacuum",
      sterilisationTempC: 121,
      bandWidthK: 3,
      minHoldSeconds: 1200,
      saturationToleranceK: 2,
      airRemoval: "prevacuum",
    });
    expect(program.requirementText).toBe("Pre-vacuum, 121–124 °C for 20 min");
    expect(programFormValues(program)).toMatchObject({ requirementKind: "steam", holdMinutes: "20", sterilisationTempC: "121" });
    const audit = await t.db.selectFrom("audit_log").select("details").where("action", "=", "program.updated").where("entity_id", "=", String(id)).executeTakeFirstOrThrow();
    expect(JSON.parse(audit.details).before.requirement.minHoldSeconds).toBe(900);
  });
});
