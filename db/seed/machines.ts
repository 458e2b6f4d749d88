import type { Transaction } from "kysely";
import type { Database, MachineKind } from "@/db/schema";
import { A0_CLASSES } from "@/lib/cycles/washer";
import type { ProgramRequirement } from "@/lib/machines/requirements";
import type { SeedResult } from "./demo";

// The demo unit's machines: three washer-disinfectors, two steam sterilisers, two heat sealers, a
// drying cabinet and an ultrasonic bath, each with its programs. Names and serial numbers are
// invented; no manufacturer is named. Washing by hand needs no machine.

interface DemoProgram {
  code: string;
  name: string;
  requirement: ProgramRequirement;
}

interface DemoMachine {
  kind: MachineKind;
  code: string;
  name: string;
  serialNumber: string;
  capacityStu: number | null;
  programs: DemoProgram[];
}

/** A0 3000 (EN ISO 15883-1): instruments, including those used without sterilisation afterwards. */
const INSTRUMENTS_A0_3000: DemoProgram = { code: "A0-3000", name: "Instruments A0 3000", requirement: { ...A0_CLASSES.notSterilisedAfterwards } };
/** A0 600 (EN ISO 15883-1): instruments that are sterilised afterwards. */
const INSTRUMENTS_A0_600: DemoProgram = { code: "A0-600", name: "Instruments A0 600", requirement: { ...A0_CLASSES.sterilisedAfterwards } };
/** 90 °C held for 5 min for containers and trays (common practice, from the 90 °C / 1 min rule with a margin). */
const CONTAINERS_90_5: DemoProgram = {
  code: "CONT-90-5",
  name: "Containers 90 °C 5 min",
  requirement: { kind: "time_temp", minTempC: 90, minHoldSeconds: 300 },
};

/** 134 °C with pre-vacuum, held 3.5 min (EN 285 requires at least 3 min at 134 °C); band 3 K and steam tolerance 2 K from memory. */
const STEAM_134: DemoProgram = {
  code: "P134",
  name: "134 °C 3.5 min prevac",
  requirement: {
    kind: "steam",
    name: "134 °C, 3.5 min, pre-vacuum",
    sterilisationTempC: 134,
    bandWidthK: 3,
    minHoldSeconds: 210,
    saturationToleranceK: 2,
    airRemoval: "prevacuum",
  },
};
/** 121 °C held 15 min (common practice), pre-vacuum. */
const STEAM_121: DemoProgram = {
  code: "P121",
  name: "121 °C 15 min",
  requirement: {
    kind: "steam",
    name: "121 °C, 15 min, pre-vacuum",
    sterilisationTempC: 121,
    bandWidthK: 3,
    minHoldSeconds: 900,
    saturationToleranceK: 2,
    airRemoval: "prevacuum",
  },
};

export const DEMO_MACHINES: readonly DemoMachine[] = [
  { kind: "washer", code: "W1", name: "Chamber washer-disinfector 1", serialNumber: "LWD-19-0317", capacityStu: 6, programs: [INSTRUMENTS_A0_3000, INSTRUMENTS_A0_600] },
  { kind: "washer", code: "W2", name: "Chamber washer-disinfector 2", serialNumber: "LWD-19-0318", capacityStu: 6, programs: [INSTRUMENTS_A0_3000, INSTRUMENTS_A0_600] },
  {
    kind: "washer",
    code: "W3",
    name: "Trolley washer-disinfector",
    serialNumber: "LWD-22-1104",
    capacityStu: 8,
    programs: [INSTRUMENTS_A0_3000, CONTAINERS_90_5],
  },
  { kind: "steriliser", code: "S1", name: "Steam steriliser 1", serialNumber: "LST-18-2201", capacityStu: 6, programs: [STEAM_134, STEAM_121] },
  { kind: "steriliser", code: "S2", name: "Steam steriliser 2", serialNumber: "LST-21-2245", capacityStu: 8, programs: [STEAM_134, STEAM_121] },
  {
    kind: "heat_sealer",
    code: "HS1",
    name: "Rotary heat sealer 1",
    serialNumber: "LHS-20-0051",
    capacityStu: null,
    programs: [{ code: "SEAL-180", name: "Pouch seal 180 °C", requirement: { kind: "set_point", tempC: 180 } }],
  },
  {
    kind: "heat_sealer",
    code: "HS2",
    name: "Rotary heat sealer 2",
    serialNumber: "LHS-23-0112",
    capacityStu: null,
    programs: [{ code: "SEAL-180", name: "Pouch seal 180 °C", requirement: { kind: "set_point", tempC: 180 } }],
  },
  {
    kind: "drying_cabinet",
    code: "DC1",
    name: "Drying cabinet",
    serialNumber: "LDC-17-0009",
    capacityStu: 4,
    programs: [{ code: "DRY-60-30", name: "Dry 60 °C 30 min", requirement: { kind: "set_point", tempC: 60, seconds: 1800 } }],
  },
  {
    kind: "ultrasonic",
    code: "US1",
    name: "Ultrasonic bath",
    serialNumber: "LUS-21-0420",
    capacityStu: 1,
    // Kept below about 45 °C so soil is not baked on (common practice).
    programs: [{ code: "US-40-10", name: "Ultrasonic 40 °C 10 min", requirement: { kind: "set_point", tempC: 40, seconds: 600 } }],
  },
];

export interface MachinesSeed {
  /** Machine ids by code. */
  machines: Record<string, number>;
  /** Program ids by "<machine code>/<program code>". */
  programs: Record<string, number>;
}

/** Writes the demo machines and their programs. */
export async function seedMachines(trx: Transaction<Database>, _result: SeedResult, now: Date): Promise<MachinesSeed> {
  const iso = now.toISOString();
  const seed: MachinesSeed = { machines: {}, programs: {} };
  for (const m of DEMO_MACHINES) {
    const { id } = await trx
      .insertInto("machines")
      .values({
        kind: m.kind,
        code: m.code,
        name: m.name,
        serial_number: m.serialNumber,
        capacity_stu: m.capacityStu,
        created_at: iso,
        updated_at: iso,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    seed.machines[m.code] = id;
    for (const p of m.programs) {
      const row = await trx
        .insertInto("programs")
        .values({ machine_id: id, code: p.code, name: p.name, requirement: JSON.stringify(p.requirement) })
        .returning("id")
        .executeTakeFirstOrThrow();
      seed.programs[`${m.code}/${p.code}`] = row.id;
    }
  }
  return seed;
}
