import "server-only";
import { type Kysely, sql, type Transaction } from "kysely";
import { z } from "zod";
import type { Database } from "@/db/schema";
import { can } from "@/lib/auth/permissions";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { isCustomerRole } from "@/lib/auth/roles";
import { contractTermsBetween } from "@/lib/contracts/service";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { capacityReport, DEFAULT_LOADS_PER_DAY } from "./capacity";
import { machinesReport, type MachineRun } from "./machines";
import { receivablesReport, revenueReport } from "./money";
import { type ClockVersion, onTimeReport, type OnTimeCycle, verdictsIn } from "./on-time";
import { addLocalDays, type Instants, isLocalDate, localDateAt, localDateRange } from "./periods";
import { stationsReport } from "./stations";
import type { Report } from "./types";
import { volumesReport } from "./volumes";

// The reports' thin queries: each reads plain rows in the caller's tenant scope and hands them to
// the pure figure functions beside it. A customer or site the caller may not see answers 404.

type Executor = Kysely<Database> | Transaction<Database>;

export const REPORT_NAMES = ["on-time", "volumes", "stations", "machines", "capacity", "revenue", "receivables"] as const;
export type ReportName = (typeof REPORT_NAMES)[number];

/** Reports that show money: only roles that may see invoices get them. */
const MONEY_REPORTS: readonly ReportName[] = ["revenue", "receivables"];

/** The longest period a report covers at once, in days. */
export const MAX_PERIOD_DAYS = 731;

const localDate = (what: string) =>
  z
    .string()
    .trim()
    .refine(isLocalDate, { error: `${what} must be a date written YYYY-MM-DD, for example 2026-11-30` })
    .optional()
    .or(z.literal("").transform(() => undefined));

const id = (what: string) =>
  z
    .string()
    .trim()
    .regex(/^[1-9]\d{0,15}$/, { error: `${what} must be the id of one from the list` })
    .transform(Number)
    .optional()
    .or(z.literal("").transform(() => undefined));

export const reportQuerySchema = z.object({
  from: localDate("from"),
  to: localDate("to"),
  customer: id("customer"),
  site: id("site"),
  grain: z.enum(["week", "month"], { error: "grain must be week or month" }).default("week"),
  days: z.coerce.number({ error: "days must be a whole number from 1 to 60" }).int().min(1).max(60).default(14),
  loadsPerDay: z.coerce.number({ error: "loadsPerDay must be a number from 1 to 48" }).min(1).max(48).default(DEFAULT_LOADS_PER_DAY),
  format: z.enum(["json", "csv"]).default("json"),
  table: z.string().trim().max(40).optional(),
});

export type ReportQuery = z.infer<typeof reportQuerySchema>;

export interface ReportFilters {
  from: string;
  to: string;
  period: Instants;
  organisationId: number | null;
  siteId: number | null;
  grain: "week" | "month";
  days: number;
  loadsPerDay: number;
  today: string;
}

function timeZone(): string {
  return serverEnv().UNIT_TIME_ZONE;
}

const formatInstant = (iso: string) => formatDateTime(iso, timeZone());

/** The filters of a request, checked: dates in order, customer and site within the caller's reach. */
export async function resolveFilters(db: Executor, user: SessionUser, query: ReportQuery, now = new Date()): Promise<ReportFilters> {
  const zone = timeZone();
  const today = localDateAt(now, zone);
  const to = query.to ?? today;
  const from = query.from ?? addLocalDays(to, -89);
  if (from > to) {
    throw new AppError("validation", `The period starts (${from}) after it ends (${to}); choose a "from" date on or before the "to" date.`, { from: ["Must be on or before to."] });
  }
  const span = Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / 86_400_000) + 1;
  if (span > MAX_PERIOD_DAYS) {
    throw new AppError("validation", `A report covers at most ${MAX_PERIOD_DAYS} days; this period has ${span}. Choose a shorter period.`, { from: ["Period too long."] });
  }
  let organisationId = query.customer ?? null;
  if (organisationId !== null) {
    const org = await db
      .selectFrom("organisations")
      .select("id")
      .where("id", "=", organisationId)
      .where("kind", "!=", "unit")
      .where(tenantScope(user, { organisation: "organisations.id" }))
      .executeTakeFirst();
    if (!org) throw notFound("That customer");
  }
  if (isCustomerRole(user.role)) organisationId = user.organisationId;
  let siteId = query.site ?? null;
  if (siteId !== null) {
    const site = await db
      .selectFrom("sites")
      .select(["id", "organisation_id"])
      .where("id", "=", siteId)
      .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }))
      .executeTakeFirst();
    if (!site || (organisationId !== null && site.organisation_id !== organisationId)) throw notFound("That site");
  }
  if (user.role === "clinic_staff") siteId = user.siteId ?? -1;
  return {
    from,
    to,
    period: localDateRange(from, to, zone),
    organisationId,
    siteId,
    grain: query.grain,
    days: query.days,
    loadsPerDay: query.loadsPerDay,
    today,
  };
}

/** Throws 403 when the caller may not see this report (money reports need invoice access). */
export function assertMayRead(user: SessionUser, name: ReportName): void {
  if (MONEY_REPORTS.includes(name) && !can(user.role, "billing.view")) {
    throw new AppError("forbidden", "Your role does not show invoices, so this report is not available to you.");
  }
}

/** The cycles whose turnaround clock may have stopped in the period, in scope and filters. */
export async function onTimeCycles(db: Executor, user: SessionUser, f: ReportFilters): Promise<OnTimeCycle[]> {
  let query = db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("organisations", "organisations.id", "cycles.organisation_id")
    .innerJoin("sites", "sites.id", "cycles.site_id")
    .select([
      "cycles.id",
      "cycles.organisation_id",
      "organisations.name as customer",
      "sites.name as site_name",
      "sets.serial",
      "set_types.name as set_name",
      "cycles.service_level",
      "cycles.received_at",
      "cycles.released_at",
      "cycles.delivered_at",
    ])
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .where("cycles.received_at", "is not", null)
    .where((eb) =>
      eb.or([
        eb.and([eb("cycles.released_at", ">=", f.period.start), eb("cycles.released_at", "<", f.period.end)]),
        eb.and([eb("cycles.delivered_at", ">=", f.period.start), eb("cycles.delivered_at", "<", f.period.end)]),
      ]),
    );
  if (f.organisationId !== null) query = query.where("cycles.organisation_id", "=", f.organisationId);
  if (f.siteId !== null) query = query.where("cycles.site_id", "=", f.siteId);
  const rows = await query.execute();
  return rows.map((r) => ({
    cycleId: r.id,
    organisationId: r.organisation_id,
    customer: r.customer,
    siteName: r.site_name,
    serial: r.serial,
    setName: r.set_name,
    serviceLevel: r.service_level,
    receivedAt: r.received_at,
    releasedAt: r.released_at,
    deliveredAt: r.delivered_at,
  }));
}

/** Every contract version of the customers, as the turnaround clock needs them. */
export async function clockVersions(db: Executor, organisationIds: Iterable<number>): Promise<Map<number, ClockVersion[]>> {
  const zone = timeZone();
  const map = new Map<number, ClockVersion[]>();
  for (const orgId of new Set(organisationIds)) {
    const versions = await contractTermsBetween(db as Kysely<Database>, orgId, { start: "1970-01-01T00:00:00.000Z", end: "9999-01-01T00:00:00.000Z" }, zone);
    map.set(orgId, versions);
  }
  return map;
}

/** The on-time report's verdicts (exported for the checks that compare it with billing). */
export async function onTimeVerdicts(db: Executor, user: SessionUser, f: ReportFilters) {
  const cycles = await onTimeCycles(db, user, f);
  const versions = await clockVersions(
    db,
    cycles.map((c) => c.organisationId),
  );
  return verdictsIn(cycles, versions, f.period);
}

async function onTime(db: Executor, user: SessionUser, f: ReportFilters): Promise<Report> {
  const verdicts = await onTimeVerdicts(db, user, f);
  return onTimeReport({ verdicts, grain: f.grain, timeZone: timeZone(), from: f.from, to: f.to, formatInstant });
}

const utcHour = (column: string) => sql<string>`substr(${sql.ref(column)}, 1, 13)`;
const hourInstant = (hour: string) => `${hour}:00:00.000Z`;

async function volumes(db: Executor, user: SessionUser, f: ReportFilters): Promise<Report> {
  let query = db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("organisations", "organisations.id", "cycles.organisation_id")
    .select((eb) => ["cycles.organisation_id", "organisations.name as customer", "set_types.set_class", utcHour("cycles.received_at").as("hour"), eb.fn.countAll<number>().as("sets")])
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .where("cycles.received_at", ">=", f.period.start)
    .where("cycles.received_at", "<", f.period.end)
    .groupBy(["cycles.organisation_id", "organisations.name", "set_types.set_class", utcHour("cycles.received_at")]);
  if (f.organisationId !== null) query = query.where("cycles.organisation_id", "=", f.organisationId);
  if (f.siteId !== null) query = query.where("cycles.site_id", "=", f.siteId);
  const rows = await query.execute();
  return volumesReport(
    rows.map((r) => ({ organisationId: r.organisation_id, customer: r.customer, setClass: r.set_class, at: hourInstant(r.hour), sets: Number(r.sets) })),
    { timeZone: timeZone(), from: f.from, to: f.to },
  );
}

async function stations(db: Executor, user: SessionUser, f: ReportFilters): Promise<Report> {
  let query = db
    .selectFrom("scan_events")
    .select((eb) => ["scan_events.station", utcHour("scan_events.at").as("hour"), eb.fn.countAll<number>().as("events")])
    .where(tenantScope(user, { organisation: "scan_events.organisation_id" }))
    .where("scan_events.at", ">=", f.period.start)
    .where("scan_events.at", "<", f.period.end)
    .groupBy(["scan_events.station", utcHour("scan_events.at")]);
  if (f.organisationId !== null) query = query.where("scan_events.organisation_id", "=", f.organisationId);
  if (f.siteId !== null) {
    const siteId = f.siteId;
    query = query.where((eb) => eb.exists(eb.selectFrom("cycles").select("cycles.id").whereRef("cycles.id", "=", "scan_events.cycle_id").where("cycles.site_id", "=", siteId)));
  }
  const rows = await query.execute();
  const days = Math.round((Date.parse(`${f.to}T00:00:00Z`) - Date.parse(`${f.from}T00:00:00Z`)) / 86_400_000) + 1;
  return stationsReport(
    rows.map((r) => ({ station: r.station, at: hourInstant(r.hour), events: Number(r.events) })),
    { timeZone: timeZone(), from: f.from, to: f.to, days },
  );
}

function parseReasons(json: string | null): string[] {
  if (!json) return [];
  try {
    const value: unknown = JSON.parse(json);
    return Array.isArray(value) ? value.map(String) : [String(value)];
  } catch {
    return [json];
  }
}

async function machines(db: Executor, _user: SessionUser, f: ReportFilters): Promise<Report> {
  const washer = await db
    .selectFrom("washer_batches")
    .innerJoin("machines", "machines.id", "washer_batches.machine_id")
    .select(["machines.code", "machines.name", "washer_batches.number", "washer_batches.status", "washer_batches.started_at", "washer_batches.ended_at", "washer_batches.reasons"])
    .where("washer_batches.started_at", ">=", f.period.start)
    .where("washer_batches.started_at", "<", f.period.end)
    .execute();
  const runs: MachineRun[] = washer.map((r) => ({
    machineCode: r.code,
    machineName: r.name,
    kind: "washer",
    number: r.number,
    status: r.status,
    startedAt: r.started_at!,
    endedAt: r.ended_at,
    reasons: parseReasons(r.reasons),
  }));
  const loads = await db
    .selectFrom("steriliser_loads")
    .innerJoin("machines", "machines.id", "steriliser_loads.machine_id")
    .select(["machines.code", "machines.name", "steriliser_loads.number", "steriliser_loads.status", "steriliser_loads.started_at", "steriliser_loads.ended_at", "steriliser_loads.reasons", "steriliser_loads.decision_notes"])
    .where("steriliser_loads.started_at", ">=", f.period.start)
    .where("steriliser_loads.started_at", "<", f.period.end)
    .execute();
  for (const r of loads) {
    const reasons = parseReasons(r.reasons);
    runs.push({
      machineCode: r.code,
      machineName: r.name,
      kind: "steriliser",
      number: r.number,
      status: r.status,
      startedAt: r.started_at!,
      endedAt: r.ended_at,
      reasons: reasons.length === 0 && r.status === "failed" && r.decision_notes ? [r.decision_notes] : reasons,
    });
  }
  return machinesReport(runs, {
    timeZone: timeZone(),
    from: f.from,
    to: f.to,
    formatInstant,
    notes: [
      "Washer-disinfector batches and steriliser loads. A load waiting for its release decision counts as a run, neither passed nor failed; a released load counts as passed.",
      "Machine runs belong to the unit, not to one customer: the customer and site filters do not apply here.",
    ],
  });
}

async function capacity(db: Executor, user: SessionUser, f: ReportFilters): Promise<Report> {
  const zone = timeZone();
  const days = Array.from({ length: f.days }, (_, i) => addLocalDays(f.today, i));
  const window = localDateRange(days[0]!, days[days.length - 1]!, zone);
  let query = db
    .selectFrom("cycles")
    .innerJoin("orders", "orders.id", "cycles.order_id")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select((eb) => [utcHour("orders.collection_from").as("hour"), eb.fn.countAll<number>().as("sets"), eb.fn.sum<number>("set_types.size_stu").as("stu")])
    .where(tenantScope(user, { organisation: "cycles.organisation_id", site: "cycles.site_id" }))
    .where("cycles.state", "=", "booked")
    .where("orders.kind", "=", "pickup")
    .where("orders.collection_from", ">=", window.start)
    .where("orders.collection_from", "<", window.end)
    .groupBy(utcHour("orders.collection_from"));
  if (f.organisationId !== null) query = query.where("cycles.organisation_id", "=", f.organisationId);
  if (f.siteId !== null) query = query.where("cycles.site_id", "=", f.siteId);
  const rows = await query.execute();
  const sterilisers = await db
    .selectFrom("machines")
    .select(["code", "capacity_stu"])
    .where("kind", "=", "steriliser")
    .where("active", "=", 1)
    .orderBy("code")
    .execute();
  return capacityReport({
    days,
    intake: rows.map((r) => ({ day: localDateAt(hourInstant(r.hour), zone), sets: Number(r.sets), stu: Number(r.stu ?? 0) })),
    sterilisers: sterilisers.map((s) => ({ code: s.code, capacityStu: s.capacity_stu ?? 0 })),
    loadsPerDay: f.loadsPerDay,
  });
}

async function revenue(db: Executor, user: SessionUser, f: ReportFilters): Promise<Report> {
  let query = db
    .selectFrom("invoices")
    .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
    .select([
      "invoices.organisation_id",
      "organisations.name as customer",
      "invoices.currency",
      "invoices.period_start",
      "invoices.tax_exclusive_minor",
      "invoices.vat_minor",
      "invoices.total_minor",
      "invoices.amount_credited_minor",
    ])
    .where(tenantScope(user, { organisation: "invoices.organisation_id" }))
    .where("invoices.status", "in", ["open", "paid", "uncollectible"])
    .where("invoices.period_start", ">=", localDateRange(`${f.from.slice(0, 7)}-01`, f.to, timeZone()).start)
    .where("invoices.period_start", "<", f.period.end);
  if (f.organisationId !== null) query = query.where("invoices.organisation_id", "=", f.organisationId);
  const rows = await query.execute();
  return revenueReport(
    rows.map((r) => ({
      organisationId: r.organisation_id,
      customer: r.customer,
      currency: r.currency,
      periodStart: r.period_start,
      netMinor: r.tax_exclusive_minor,
      vatMinor: r.vat_minor,
      totalMinor: r.total_minor,
      creditedMinor: r.amount_credited_minor,
    })),
    { timeZone: timeZone(), from: f.from, to: f.to },
  );
}

async function receivables(db: Executor, user: SessionUser, f: ReportFilters): Promise<Report> {
  let query = db
    .selectFrom("invoices")
    .innerJoin("organisations", "organisations.id", "invoices.organisation_id")
    .select(["invoices.organisation_id", "organisations.name as customer", "invoices.number", "invoices.currency", "invoices.due_date", "invoices.amount_due_minor"])
    .where(tenantScope(user, { organisation: "invoices.organisation_id" }))
    .where("invoices.status", "=", "open")
    .where("invoices.due_date", "is not", null)
    .where("invoices.amount_due_minor", ">", 0);
  if (f.organisationId !== null) query = query.where("invoices.organisation_id", "=", f.organisationId);
  const rows = await query.execute();
  const report = receivablesReport(
    rows.map((r) => ({ organisationId: r.organisation_id, customer: r.customer, number: r.number, currency: r.currency, dueDate: r.due_date!, amountDueMinor: r.amount_due_minor })),
    f.today,
  );
  report.notes.push("The period filter does not apply: this is what is owed today.");
  return report;
}

const BUILDERS: Record<ReportName, (db: Executor, user: SessionUser, f: ReportFilters) => Promise<Report>> = {
  "on-time": onTime,
  volumes,
  stations,
  machines,
  capacity,
  revenue,
  receivables,
};

/** One report for the caller, filters checked. */
export async function buildReport(db: Executor, user: SessionUser, name: ReportName, query: ReportQuery, now = new Date()): Promise<{ report: Report; filters: ReportFilters }> {
  assertMayRead(user, name);
  const filters = await resolveFilters(db, user, query, now);
  const report = await BUILDERS[name](db, user, filters);
  return { report, filters };
}


/** The customers and sites the caller may filter by (its own only, for a customer). */
export async function reportFilterChoices(db: Executor, user: SessionUser) {
  const customers = await db
    .selectFrom("organisations")
    .select(["id", "name"])
    .where("kind", "!=", "unit")
    .where(tenantScope(user, { organisation: "organisations.id" }))
    .orderBy("name")
    .execute();
  const sites = await db
    .selectFrom("sites")
    .select(["id", "name", "organisation_id"])
    .where("is_depot", "=", 0)
    .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }))
    .orderBy("name")
    .execute();
  return {
    customers: customers.map((c) => ({ id: c.id, name: c.name })),
    sites: sites.map((s) => ({ id: s.id, name: s.name, organisationId: s.organisation_id })),
  };
}

/** The default period of the report pages: the 90 days up to today, unit time. */
export function defaultPeriod(now = new Date()): { from: string; to: string } {
  const to = localDateAt(now, timeZone());
  return { from: addLocalDays(to, -89), to };
}
