import { createHash } from "node:crypto";
import { sql, type Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { parseFlags } from "@/lib/catalogue/set-types";
import { recordToCsv } from "@/lib/cycles/csv";
import { parseWasherRecord } from "@/lib/cycles/parse";
import { synthWasherRecord } from "@/lib/cycles/synth";
import { checkWasherBatch } from "@/lib/cycles/washer";
import { serverEnv } from "@/lib/env";
import { washerRequirementOf } from "@/lib/machines/requirements";
import { toStoredFigures } from "@/lib/washing/figures";
import { fileStore } from "@/lib/storage/store";
import { batchNumberPrefix, nextBatchNumber } from "@/lib/washing/numbering";
import type { SeedResult } from "./demo";

// The washer batches behind the demo's history. The history records every machine wash of a set
// as a "wash_passed" (or "wash_failed") scan event at the washing station, without a batch; this
// seed groups those events into batches after the fact and gives each a synthetic record, so
// every washed set of the history can be traced to a batch, its machine, its program and its
// time/temperature curve. Scan events are append-only and keep their empty batch_id:
// washer_batch_items is the link.
//
// Decisions:
// - Events at most 15 minutes apart (and fitting the smallest washer, 6 StU) form one batch; the
//   batch ends just before the first of them, so every set is recorded washed after its batch
//   ended, and starts no earlier than the moment its last set was ready (received, or sent back
//   to washing) — 40 minutes before its end at most. Each batch goes to the first washer free by
//   then (W1, W2, W3 in turn), running its "Instruments A0 3000" program.
// - A "wash_failed" event of the history becomes a failed batch of its own: its record stays
//   too cool (78 °C) for A0 3000, and the check's reasons are kept. Should the history hold no
//   such event, the earliest passed batch gets a failed run of the same sets before it.
// - Sets whose type is for manual washing only are left out: a washer never takes them.
// - Records carry timestamps, one sample every 20 s, 0.1 °C resolution and ±0.3 K of noise from a
//   generator seeded by the batch's place in time, so every run writes the same files.

const MINUTE = 60_000;
const CLUSTER_WINDOW_MS = 15 * MINUTE;
const CLUSTER_CAPACITY_STU = 6;
const LONGEST_RUN_MS = 40 * MINUTE;
const SHORTEST_RUN_MS = 8 * MINUTE;
const WASHERS = ["W1", "W2", "W3"] as const;
const PROGRAM = "A0-3000";
const PASS_HOLD_C = 93;
const FAIL_HOLD_C = 78;

interface WashEvent {
  cycleId: number;
  event: "wash_passed" | "wash_failed";
  at: number;
  readyAt: number;
  userId: number | null;
  sizeStu: number;
}

interface Cluster {
  passed: boolean;
  events: WashEvent[];
  stu: number;
}

interface PlannedBatch {
  cluster: Cluster;
  washer: (typeof WASHERS)[number];
  startedAt: number;
  endedAt: number;
  closedAt: number;
  index: number;
}

export interface BatchesSeed {
  passed: number;
  failed: number;
  /** Batch ids by number. */
  batches: Record<string, number>;
}

function clusters(events: WashEvent[], passed: boolean): Cluster[] {
  const out: Cluster[] = [];
  let current: Cluster | null = null;
  for (const e of events) {
    if (!current || e.at - current.events[0]!.at > CLUSTER_WINDOW_MS || current.stu + e.sizeStu > CLUSTER_CAPACITY_STU) {
      current = { passed, events: [], stu: 0 };
      out.push(current);
    }
    current.events.push(e);
    current.stu += e.sizeStu;
  }
  return out;
}

/** The record of one batch: heating, the disinfection hold and drying fitted into its run time. */
function recordFor(durationS: number, holdTempC: number, seed: number) {
  const holdSeconds = Math.round(Math.min(300, Math.max(180, durationS * 0.125)) / 20) * 20;
  const dryingSeconds = Math.round((durationS * 0.375) / 20) * 20;
  const rampSeconds = Math.max(20, durationS - holdSeconds - dryingSeconds);
  return synthWasherRecord({ holdTempC, holdSeconds, rampSeconds, dryingSeconds, stepSeconds: 20, noiseK: 0.3, seed });
}

async function storeRecord(trx: Transaction<Database>, csv: string, name: string, uploadedBy: number | null, at: string): Promise<number> {
  const bytes = Buffer.from(csv, "utf8");
  const sha256 = createHash("sha256").update(bytes).digest("hex");
  const key = `demo/${sha256}`;
  await fileStore().put(key, bytes, "text/csv", { replace: true });
  const { id } = await trx
    .insertInto("files")
    .values({
      organisation_id: null,
      purpose: "cycle_record",
      original_name: name,
      content_type: "text/csv",
      size_bytes: bytes.length,
      sha256,
      storage_key: key,
      uploaded_by: uploadedBy,
      created_at: at,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  return id;
}

/** Groups the history's machine washes into washer batches with their records. */
export async function seedBatches(trx: Transaction<Database>, result: SeedResult, now: Date): Promise<BatchesSeed> {
  const machines = result.machines;
  const programs = result.programs;
  if (!machines || !programs) throw new Error("Seed the machines before the washer batches.");
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const rows = await trx
    .selectFrom("scan_events as e")
    .innerJoin("sets as s", "s.id", "e.set_id")
    .innerJoin("set_types as st", "st.id", "s.set_type_id")
    .select([
      "e.cycle_id",
      "e.event",
      "e.at",
      "e.user_id",
      "st.size_stu",
      "st.processing_flags",
      sql<string | null>`(select max(p.at) from scan_events p where p.cycle_id = e.cycle_id and p.at < e.at)`.as("ready_at"),
    ])
    .where("e.event", "in", ["wash_passed", "wash_failed"])
    .where("e.station", "=", "washing")
    .where("e.batch_id", "is", null)
    .where("e.at", "<=", now.toISOString())
    .orderBy("e.at")
    .orderBy("e.id")
    .execute();
  const events: WashEvent[] = rows
    .filter((r) => !parseFlags(r.processing_flags).includes("manual_wash_only"))
    .map((r) => ({
      cycleId: r.cycle_id,
      event: r.event as WashEvent["event"],
      at: Date.parse(r.at),
      readyAt: r.ready_at ? Date.parse(r.ready_at) : Date.parse(r.at) - 2 * LONGEST_RUN_MS,
      userId: r.user_id,
      sizeStu: r.size_stu,
    }));

  const all = [
    ...clusters(events.filter((e) => e.event === "wash_passed"), true),
    ...clusters(events.filter((e) => e.event === "wash_failed"), false),
  ].sort((a, b) => a.events[0]!.at - b.events[0]!.at);

  // Without a failed wash in the history, the earliest passed batch is preceded by a failed run.
  if (!all.some((c) => !c.passed)) {
    const first = all.find((c) => c.passed);
    if (first) {
      const shift = LONGEST_RUN_MS + 20 * MINUTE;
      all.unshift({
        passed: false,
        stu: first.stu,
        events: first.events.map((e) => ({ ...e, event: "wash_failed", at: e.at - shift, readyAt: e.readyAt - shift })),
      });
    }
  }

  // Times and washers.
  const busyUntil: Record<string, number> = { W1: 0, W2: 0, W3: 0 };
  const planned: PlannedBatch[] = all.map((cluster, index) => {
    const firstAt = cluster.events[0]!.at;
    const lastAt = cluster.events[cluster.events.length - 1]!.at;
    const endedAt = firstAt - ((index % 4) + 1) * MINUTE;
    const ready = Math.max(...cluster.events.map((e) => e.readyAt)) + 2 * MINUTE;
    const startedAt = Math.min(endedAt - SHORTEST_RUN_MS, Math.max(endedAt - LONGEST_RUN_MS, ready));
    const free = WASHERS.map((_, k) => WASHERS[(index + k) % WASHERS.length]!).find((w) => busyUntil[w]! <= startedAt);
    const washer = free ?? WASHERS.reduce((a, b) => (busyUntil[a]! <= busyUntil[b]! ? a : b));
    busyUntil[washer] = endedAt;
    return { cluster, washer, startedAt: Math.round(startedAt / 1000) * 1000, endedAt: Math.round(endedAt / 1000) * 1000, closedAt: lastAt, index };
  });
  planned.sort((a, b) => a.startedAt - b.startedAt || a.index - b.index);

  const numbers = new Map<string, string[]>();
  const seed: BatchesSeed = { passed: 0, failed: 0, batches: {} };
  for (const plan of planned) {
    const machineId = machines[plan.washer];
    const programId = programs[`${plan.washer}/${PROGRAM}`];
    if (machineId === undefined || programId === undefined) throw new Error(`The demo machines have no ${plan.washer} with program ${PROGRAM}.`);
    const program = await trx.selectFrom("programs").select("requirement").where("id", "=", programId).executeTakeFirstOrThrow();
    const requirement = washerRequirementOf(program.requirement);
    if (!requirement) throw new Error(`Program ${PROGRAM} of ${plan.washer} has no washer requirement.`);

    const durationS = Math.round((plan.endedAt - plan.startedAt) / 1000);
    const startedIso = new Date(plan.startedAt).toISOString();
    const synthetic = recordFor(durationS, plan.cluster.passed ? PASS_HOLD_C : FAIL_HOLD_C, plan.index + 1);
    const csv = recordToCsv(synthetic, { startedAt: startedIso, decimals: 1 });
    // The figures are those of the stored file, read back as the washing station reads a record.
    const record = parseWasherRecord(csv);
    const check = checkWasherBatch(record, requirement);
    if (check.passed !== plan.cluster.passed) throw new Error(`The demo record of batch ${plan.index} does not ${plan.cluster.passed ? "pass" : "fail"} as planned.`);
    const prefix = batchNumberPrefix(plan.washer, new Date(plan.startedAt), timeZone);
    const used = numbers.get(prefix) ?? [];
    const number = nextBatchNumber(prefix, used);
    numbers.set(prefix, [...used.slice(-1), number]);
    const userId = plan.cluster.events[0]!.userId;
    const closedIso = new Date(plan.closedAt).toISOString();
    const fileId = await storeRecord(trx, csv, `${number}.csv`, userId, closedIso);
    const figures = toStoredFigures(record, requirement, check);
    const { id } = await trx
      .insertInto("washer_batches")
      .values({
        number,
        machine_id: machineId,
        program_id: programId,
        status: plan.cluster.passed ? "passed" : "failed",
        started_by: userId,
        started_at: startedIso,
        ended_at: new Date(plan.startedAt + durationS * 1000).toISOString(),
        record_file_id: fileId,
        figures: JSON.stringify(figures),
        reasons: JSON.stringify(check.reasons),
        closed_by: userId,
        closed_at: closedIso,
        created_at: new Date(plan.startedAt - 3 * MINUTE).toISOString(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    const seen = new Set<number>();
    const items = plan.cluster.events.filter((e) => !seen.has(e.cycleId) && seen.add(e.cycleId));
    await trx
      .insertInto("washer_batch_items")
      .values(items.map((e, i) => ({ batch_id: id, cycle_id: e.cycleId, added_at: new Date(plan.startedAt - MINUTE + i * 5000).toISOString() })))
      .execute();
    seed.batches[number] = id;
    if (plan.cluster.passed) seed.passed += 1;
    else seed.failed += 1;
  }
  return seed;
}
