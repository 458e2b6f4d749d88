import type { Transaction } from "kysely";
import type { Database, MachineLogKind } from "@/db/schema";
import { checkReadings, DEFAULT_LIMITS } from "@/lib/monitoring/limits";
import type { SeedResult } from "./demo";

// The demo's monitoring and maintenance log: 90 days of daily seal tests on both heat sealers,
// daily sterile store climate and water treatment readings, salt refills, weekly cleaning of
// each washer's wash arms and sieves, two service visits and one fault that was cleared the next
// day — plus the chamber sizes of the machines. Two things are left for the home page to warn
// about: a final-rinse conductivity reading out of range two days ago, and the trolley washer W3,
// whose weekly cleaning was last recorded ten days ago. Readings come from a generator seeded by
// the day, so every run writes the same log. The service company is invented.

const DAY_MS = 86_400_000;
const DAYS = 90;

/** A small deterministic generator (mulberry32), one per day and series. */
function noise(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

const round = (v: number, digits: number) => Number(v.toFixed(digits));

/** Inner chamber sizes (mm) of the demo's machines: invented, sized to hold the StU capacity each is given. */
const CHAMBERS: Record<string, [number, number, number]> = {
  W1: [620, 950, 640],
  W2: [620, 950, 640],
  W3: [650, 1250, 650],
  S1: [680, 1000, 700],
  S2: [680, 680, 1270],
  DC1: [620, 650, 700],
};

interface Entry {
  kind: MachineLogKind;
  machine?: string;
  at: number;
  by: string;
  place?: string;
  outcome?: "pass" | "fail";
  temperatureC?: number;
  humidityPct?: number;
  conductivityUsCm?: number;
  hardnessMmolL?: number;
  saltKg?: number;
  provider?: string;
  reference?: string;
  notes?: string;
  cleared?: { at: number; by: string; note: string };
}

export async function seedMonitoring(trx: Transaction<Database>, result: SeedResult, now: Date): Promise<void> {
  const machines = result.machines ?? {};
  for (const [code, [w, h, d]] of Object.entries(CHAMBERS)) {
    if (!machines[code]) continue;
    await trx.updateTable("machines").set({ chamber_width_mm: w, chamber_height_mm: h, chamber_depth_mm: d }).where("id", "=", machines[code]!).execute();
  }

  const quality = "quality@larkmoor.example";
  const techs = ["tech@larkmoor.example", "tech2@larkmoor.example"];
  // Midnight UTC of today; entries are placed at fixed UTC hours of each past day.
  const today = Math.floor(now.getTime() / DAY_MS) * DAY_MS;
  const entries: Entry[] = [];
  const hour = (daysAgo: number, h: number, m = 0) => today - daysAgo * DAY_MS + (h * 60 + m) * 60_000;

  for (let daysAgo = DAYS - 1; daysAgo >= 0; daysAgo--) {
    const rnd = noise(20_261_201 + daysAgo);
    const by = techs[daysAgo % 2]!;
    for (const sealer of ["HS1", "HS2"]) {
      if (sealer === "HS2" && daysAgo === 14) {
        entries.push({ kind: "seal_test", machine: sealer, at: hour(daysAgo, 7, 20), by, outcome: "fail", notes: "Seal channel incomplete at one edge of the test strip." });
        entries.push({ kind: "seal_test", machine: sealer, at: hour(daysAgo, 9, 5), by: quality, outcome: "pass", notes: "Repeated after cleaning the sealing bars." });
        continue;
      }
      entries.push({ kind: "seal_test", machine: sealer, at: hour(daysAgo, 7, sealer === "HS1" ? 10 : 15), by, outcome: "pass" });
    }
    entries.push({
      kind: "store_climate",
      at: hour(daysAgo, 8, 0),
      by,
      place: "Sterile store",
      temperatureC: round(18.3 + rnd() * 1.5, 1),
      humidityPct: round(43 + rnd() * 13, 0),
    });
    entries.push({
      kind: "water_reading",
      at: hour(daysAgo, 7, 40),
      by,
      conductivityUsCm: daysAgo === 2 ? 38.5 : round(3 + rnd() * 7, 1),
      hardnessMmolL: round(0.02 + rnd() * 0.08, 2),
      notes: daysAgo === 2 ? "Reverse-osmosis plant alarm earlier this morning; reading taken at the final-rinse tap." : undefined,
    });
    if (daysAgo % 10 === 4) entries.push({ kind: "salt_refill", at: hour(daysAgo, 12, 30), by, saltKg: 25 });
    if (daysAgo % 7 === 2) {
      for (const washer of ["W1", "W2"]) entries.push({ kind: "washer_cleaning", machine: washer, at: hour(daysAgo, 15, washer === "W1" ? 0 : 30), by });
    }
    if (daysAgo % 7 === 3 && daysAgo >= 10) entries.push({ kind: "washer_cleaning", machine: "W3", at: hour(daysAgo, 15, 45), by });
  }
  entries.push({
    kind: "service",
    machine: "W1",
    at: hour(61, 10, 0),
    by: quality,
    provider: "Tallowmere Engineering",
    reference: "TM-40188",
    notes: "Annual service: dosing pumps calibrated, door seal and spray arm bearings checked, thermometric test passed.",
  });
  entries.push({
    kind: "service",
    machine: "S1",
    at: hour(40, 9, 30),
    by: quality,
    provider: "Tallowmere Engineering",
    reference: "TM-40217",
    notes: "Annual service and revalidation; vacuum leak test and air-removal test passed afterwards.",
  });
  entries.push({
    kind: "fault",
    machine: "W2",
    at: hour(25, 11, 20),
    by: techs[0]!,
    notes: "Water on the floor under the door; the panel showed a low rinse pressure warning. Machine taken out of use.",
    cleared: { at: hour(24, 14, 0), by: quality, note: "Door seal replaced by the visiting engineer; a test cycle passed its checks." },
  });

  const iso = (ms: number) => new Date(ms).toISOString();
  for (const e of entries.filter((e) => e.at <= now.getTime()).sort((a, b) => a.at - b.at)) {
    const findings = checkReadings(
      { outcome: e.outcome ?? null, temperatureC: e.temperatureC, humidityPct: e.humidityPct, conductivityUsCm: e.conductivityUsCm, hardnessMmolL: e.hardnessMmolL },
      DEFAULT_LIMITS,
      e.kind,
    );
    const recordedAt = e.at + 5 * 60_000;
    await trx
      .insertInto("machine_log")
      .values({
        kind: e.kind,
        machine_id: e.machine ? machines[e.machine]! : null,
        place: e.place ?? null,
        at: iso(e.at),
        recorded_by: result.users[e.by]!,
        recorded_at: iso(Math.min(recordedAt, now.getTime())),
        outcome: e.outcome ?? null,
        temperature_c: e.temperatureC ?? null,
        humidity_pct: e.humidityPct ?? null,
        conductivity_us_cm: e.conductivityUsCm ?? null,
        hardness_mmol_l: e.hardnessMmolL ?? null,
        salt_kg: e.saltKg ?? null,
        provider: e.provider ?? null,
        reference: e.reference ?? null,
        notes: e.notes ?? null,
        cleared_at: e.cleared ? iso(e.cleared.at) : null,
        cleared_by: e.cleared ? result.users[e.cleared.by]! : null,
        clearance_note: e.cleared?.note ?? null,
        out_of_range: findings.length > 0 ? 1 : 0,
        findings: JSON.stringify(findings),
      })
      .execute();
  }
}
