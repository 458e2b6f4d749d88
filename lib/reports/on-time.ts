import type { VersionValidity } from "@/lib/billing/run-periods";
import { type CycleClock, cycleClock, type CycleClockTerms, cycleTurnaround } from "@/lib/turnaround/cycle";
import { localDayOf } from "@/lib/turnaround/local-time";
import type { ServiceLevel } from "@/lib/turnaround/promise";
import { bucketLabel, bucketOf, bucketsBetween, type Grain, type Instants, localDateAt } from "./periods";
import { percent, type Report, type ReportChart, type ReportTable } from "./types";

// On-time return (pure): each cycle's verdict under its contract, grouped per customer, service
// level and week or month.
//
// Decisions:
// - Late is the turnaround module's verdict (cycleTurnaround) under the contract version in force
//   when the set was delivered (when it was released, while it is not yet delivered): the same
//   version and the same function the invoice's SLA credit uses (lib/billing/run-pricing.ts).
// - A cycle counts in the week or month in which its clock stopped (released or delivered, as its
//   contract says), in the unit's time zone. A cycle whose clock still runs, or with no receipt
//   time, has no verdict and is not counted; one delivered while no version was in force neither.

export interface ClockVersion extends CycleClockTerms, VersionValidity {
  reference: string;
}

export interface OnTimeCycle {
  cycleId: number;
  organisationId: number;
  customer: string;
  siteName: string;
  serial: string;
  setName: string;
  serviceLevel: ServiceLevel;
  receivedAt: string | null;
  releasedAt: string | null;
  deliveredAt: string | null;
}

export interface CycleVerdict {
  cycle: OnTimeCycle;
  contractReference: string;
  clockStopsAt: "released" | "delivered";
  stoppedAt: string;
  dueAt: string;
  late: boolean;
  lateByMinutes: number;
}

/** The version whose validity holds the instant, as billing picks it (partAt). */
export function versionAt<T extends VersionValidity>(versions: readonly T[], at: string): T | undefined {
  const t = Date.parse(at);
  return versions.find((v) => Date.parse(v.validFrom) <= t && (v.validTo === null || t < Date.parse(v.validTo)));
}

const clockPerCall = (version: ClockVersion): CycleClock => (times) => cycleTurnaround(times, version);

/**
 * A cycle's verdict under its contract, or null while it has none (see the decisions above).
 * `clockOf` gives the clock of a version; verdictsIn passes one that keeps a clock per version.
 */
export function cycleVerdict(
  cycle: OnTimeCycle,
  versions: readonly ClockVersion[],
  clockOf: (version: ClockVersion) => CycleClock = clockPerCall,
): CycleVerdict | null {
  const pickAt = cycle.deliveredAt ?? cycle.releasedAt;
  if (!pickAt) return null;
  const version = versionAt(versions, pickAt);
  if (!version) return null;
  const outcome = clockOf(version)(
    { serviceLevel: cycle.serviceLevel, receivedAt: cycle.receivedAt, releasedAt: cycle.releasedAt, deliveredAt: cycle.deliveredAt },
  );
  if (!outcome) return null;
  const stoppedAt = (version.clockStopsAt === "released" ? cycle.releasedAt : cycle.deliveredAt)!;
  return {
    cycle,
    contractReference: version.reference,
    clockStopsAt: version.clockStopsAt,
    stoppedAt,
    dueAt: outcome.dueAt.toISOString(),
    late: outcome.late,
    lateByMinutes: outcome.lateByMinutes,
  };
}

export interface OnTimeGroup {
  organisationId: number;
  customer: string;
  serviceLevel: ServiceLevel;
  bucket: string;
  measured: number;
  late: number;
  lateCycleIds: number[];
}

/** Verdicts of the cycles whose clock stopped inside the period, sorted by when it stopped. */
export function verdictsIn(
  cycles: readonly OnTimeCycle[],
  versionsByCustomer: ReadonlyMap<number, readonly ClockVersion[]>,
  period: Instants,
): CycleVerdict[] {
  const start = Date.parse(period.start);
  const end = Date.parse(period.end);
  const verdicts: CycleVerdict[] = [];
  // One clock per contract version: its calendar is compiled once, not once per cycle.
  const clocks = new Map<ClockVersion, CycleClock>();
  const clockOf = (version: ClockVersion) => {
    let clock = clocks.get(version);
    if (!clock) clocks.set(version, (clock = cycleClock(version)));
    return clock;
  };
  for (const cycle of cycles) {
    const verdict = cycleVerdict(cycle, versionsByCustomer.get(cycle.organisationId) ?? [], clockOf);
    if (!verdict) continue;
    const t = Date.parse(verdict.stoppedAt);
    if (t >= start && t < end) verdicts.push(verdict);
  }
  return verdicts.sort((a, b) => a.stoppedAt.localeCompare(b.stoppedAt) || a.cycle.cycleId - b.cycle.cycleId);
}

/**
 * The verdicts grouped per customer, service level and bucket, in customer, level, time order.
 * `bucketAt` gives a verdict's bucket (by default worked out from when its clock stopped).
 */
export function groupOnTime(
  verdicts: readonly CycleVerdict[],
  grain: Grain,
  timeZone: string,
  bucketAt: (verdict: CycleVerdict) => string = (v) => bucketOf(v.stoppedAt, grain, timeZone),
): OnTimeGroup[] {
  const groups = new Map<string, OnTimeGroup>();
  for (const v of verdicts) {
    const bucket = bucketAt(v);
    const key = `${v.cycle.organisationId}|${v.cycle.serviceLevel}|${bucket}`;
    let group = groups.get(key);
    if (!group) {
      group = { organisationId: v.cycle.organisationId, customer: v.cycle.customer, serviceLevel: v.cycle.serviceLevel, bucket, measured: 0, late: 0, lateCycleIds: [] };
      groups.set(key, group);
    }
    group.measured += 1;
    if (v.late) {
      group.late += 1;
      group.lateCycleIds.push(v.cycle.cycleId);
    }
  }
  return [...groups.values()].sort(
    (a, b) => a.customer.localeCompare(b.customer) || a.serviceLevel.localeCompare(b.serviceLevel) || a.bucket.localeCompare(b.bucket),
  );
}

const LEVEL_LABEL: Record<ServiceLevel, string> = { standard: "Standard", express: "Express" };

function hoursAndMinutes(minutes: number): string {
  return `${Math.floor(minutes / 60)}:${String(minutes % 60).padStart(2, "0")}`;
}

/** The on-time report: a chart per customer, the figures, and the late cycles behind them. */
export function onTimeReport(input: {
  verdicts: readonly CycleVerdict[];
  grain: Grain;
  timeZone: string;
  from: string;
  to: string;
  formatInstant: (iso: string) => string;
}): Report {
  const { verdicts, grain, timeZone } = input;
  // Each verdict's bucket, worked out once for the figures, the late sets and the chart; a bucket
  // depends only on the local day, so it is worked out once per day.
  const bucketOfVerdict = new Map<CycleVerdict, string>();
  const bucketOfDay = new Map<number, string>();
  const bucketAt = (v: CycleVerdict) => {
    let bucket = bucketOfVerdict.get(v);
    if (bucket === undefined) {
      const day = localDayOf(timeZone, Date.parse(v.stoppedAt));
      bucket = bucketOfDay.get(day);
      if (bucket === undefined) bucketOfDay.set(day, (bucket = bucketOf(v.stoppedAt, grain, timeZone)));
      bucketOfVerdict.set(v, bucket);
    }
    return bucket;
  };
  const groups = groupOnTime(verdicts, grain, timeZone, bucketAt);
  const figures: ReportTable = {
    key: "figures",
    title: `On-time return per customer, service level and ${grain}`,
    columns: [
      { key: "customer", label: "Customer" },
      { key: "service_level", label: "Service level" },
      { key: "period", label: grain === "week" ? "Week from" : "Month" },
      { key: "measured", label: "Sets measured", numeric: true },
      { key: "on_time", label: "On time", numeric: true },
      { key: "late", label: "Late", numeric: true },
      { key: "on_time_pct", label: "On time %", numeric: true },
    ],
    rows: groups.map((g) => ({
      customer: g.customer,
      service_level: LEVEL_LABEL[g.serviceLevel],
      period: g.bucket,
      measured: g.measured,
      on_time: g.measured - g.late,
      late: g.late,
      on_time_pct: percent(g.measured - g.late, g.measured),
    })),
  };
  const late: ReportTable = {
    key: "late",
    title: "The late sets behind these figures",
    columns: [
      { key: "customer", label: "Customer" },
      { key: "site", label: "Site" },
      { key: "serial", label: "Set" },
      { key: "set_name", label: "Set type" },
      { key: "service_level", label: "Service level" },
      { key: "period", label: grain === "week" ? "Week from" : "Month" },
      { key: "received", label: "Received" },
      { key: "due", label: "Due" },
      { key: "clock_stopped", label: "Clock stopped" },
      { key: "late_by", label: "Late by (h:mm)", numeric: true },
      { key: "contract", label: "Contract" },
    ],
    rows: verdicts
      .filter((v) => v.late)
      .map((v) => ({
        customer: v.cycle.customer,
        site: v.cycle.siteName,
        serial: v.cycle.serial,
        set_name: v.cycle.setName,
        service_level: LEVEL_LABEL[v.cycle.serviceLevel],
        period: bucketAt(v),
        received: input.formatInstant(v.cycle.receivedAt!),
        due: input.formatInstant(v.dueAt),
        clock_stopped: `${input.formatInstant(v.stoppedAt)} (${v.clockStopsAt})`,
        late_by: hoursAndMinutes(v.lateByMinutes),
        contract: v.contractReference,
      })),
  };

  // One line per customer, all service levels together.
  const buckets = bucketsBetween(input.from, input.to, grain);
  const customers = [...new Map(verdicts.map((v) => [v.cycle.organisationId, v.cycle.customer])).entries()].sort((a, b) => a[1].localeCompare(b[1]));
  const perCustomer = new Map<string, { measured: number; late: number }>();
  for (const v of verdicts) {
    const key = `${v.cycle.organisationId}|${bucketAt(v)}`;
    const entry = perCustomer.get(key) ?? { measured: 0, late: 0 };
    entry.measured += 1;
    if (v.late) entry.late += 1;
    perCustomer.set(key, entry);
  }
  const chart: ReportChart = {
    kind: "line",
    title: `Sets returned on time, per ${grain} (%)`,
    x: "period",
    xLabel: grain === "week" ? "Week (Monday, unit time)" : "Month (unit time)",
    yLabel: "On time %",
    unit: "%",
    series: customers.map(([id, name]) => ({ key: `c${id}`, label: name })),
    points: buckets.map((bucket) => {
      const point: Record<string, string | number | null> = { period: bucketLabel(bucket, grain) };
      for (const [id] of customers) {
        const entry = perCustomer.get(`${id}|${bucket}`);
        point[`c${id}`] = entry ? Number(percent(entry.measured - entry.late, entry.measured)) : null;
      }
      return point;
    }),
  };
  const total = verdicts.length;
  const lateCount = verdicts.filter((v) => v.late).length;
  return {
    name: "on-time",
    title: "On-time return",
    notes: [
      `${total} set${total === 1 ? "" : "s"} measured from ${input.from} to ${input.to}: ${total - lateCount} on time, ${lateCount} late (${percent(total - lateCount, total) ?? "–"} % on time).`,
      "Late means the turnaround clock stopped after the time the contract promised: the clock runs from receipt at the unit to release or to delivery, as the customer's contract says, in its service calendar. The invoice's turnaround credit uses the same verdict.",
      `A set counts in the ${grain} its clock stopped, in the unit's time zone (${timeZone}); sets still in process are not counted yet.`,
    ],
    charts: [chart],
    tables: [figures, late],
  };
}

/** The local date the verdict's clock stopped, for filters and tests. */
export function stoppedOn(verdict: CycleVerdict, timeZone: string): string {
  return localDateAt(verdict.stoppedAt, timeZone);
}
