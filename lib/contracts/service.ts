import "server-only";
import { type Kysely, type Selectable, sql } from "kysely";
import type { ContractsTable, Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { SET_CLASS_LABELS, SET_CLASSES, isSetClass } from "@/lib/catalogue/vocabulary";
import { serverEnv } from "@/lib/env";
import { AppError, notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { PricingError } from "@/lib/pricing/errors";
import { assertContractTerms } from "@/lib/pricing/price-period";
import { parseInstant } from "@/lib/pricing/period";
import {
  SURCHARGE_KINDS,
  type ContractTerms,
  type SurchargeKind,
  type SurchargeRule,
  type VatCategoryCode,
  type VolumeBand,
} from "@/lib/pricing/types";
import { type ServiceCalendar, serviceCalendarSchema } from "@/lib/turnaround/calendar";
import { type ContractStatus, contractStatus, localDateOf, validityInstants } from "./dates";
import { formatValidity } from "./format";
import type { ContractVersionInput, ListContractsQuery } from "./schemas";

// Contract versions: listing and reading in the caller's scope, creating, correcting and ending
// versions, and the terms in force at an instant for billing and ordering.
//
// Decisions:
// - Validity dates are local dates in the unit's time zone (UNIT_TIME_ZONE), both inclusive.
//   Two versions of one customer never share a day; the check runs inside the write's
//   transaction and answers 409 naming the version in the way.
// - Finance may correct a version at any time, also one that has started or ended (a wrong price
//   is fixed where it is wrong). Every change is audited in the same transaction with the value
//   of each changed field before and after. Invoices already issued keep the amounts they were
//   issued with; correcting a version does not re-price them.
// - A version stays with its customer: moving terms to another customer is a new version there.

export type ClockStop = "released" | "delivered";

export interface ContractListRow {
  id: number;
  organisationId: number;
  organisationName: string;
  reference: string;
  validFrom: string;
  validUntil: string | null;
  status: ContractStatus;
  currency: string;
  turnaroundStandardHours: number;
  turnaroundExpressHours: number;
}

export interface ClassRateView {
  setClass: string;
  label: string;
  bands: VolumeBand[];
}

export interface ContractDetail extends ContractListRow {
  vatCategory: "S" | "Z";
  vatRateBasisPoints: number;
  paymentTermsDays: number;
  clockStopsAt: ClockStop;
  serviceCalendar: ServiceCalendar;
  minimumMonthlyFeeMinor: number;
  slaCreditBasisPoints: number;
  notes: string | null;
  rates: ClassRateView[];
  surcharges: SurchargeRule[];
  createdAt: string;
  updatedAt: string;
}

/**
 * The contract version in force, as lib/pricing's ContractTerms (so it can be passed straight to
 * `priceInvoicePeriod`) plus what the turnaround clock needs. `contractId` is the version's
 * reference, which pricing messages and invoice notes show; `id` is the database id.
 */
export interface ContractTermsInForce extends ContractTerms {
  id: number;
  organisationId: number;
  reference: string;
  /** Local dates as agreed, inclusive; `validFrom`/`validTo` are the same as instants. */
  validFromDate: string;
  validUntilDate: string | null;
  serviceCalendar: ServiceCalendar;
  clockStopsAt: ClockStop;
}

export interface ContractHistoryEntry {
  id: number;
  at: string;
  action: string;
  actorName: string | null;
  changes: { field: string; before: unknown; after: unknown }[];
}

/** The unit's time zone, in which validity dates are read. */
export function unitTimeZone(): string {
  return serverEnv().UNIT_TIME_ZONE;
}

/** The unit's local date today. */
export function unitToday(now = new Date()): string {
  return localDateOf(now, unitTimeZone());
}

const SORT_COLUMNS = {
  organisation: "organisations.name",
  reference: "contracts.reference",
  valid_from: "contracts.valid_from",
  valid_until: "contracts.valid_until",
  // The alias of the derived status selected below.
  status: "status",
} as const;

function statusExpression(today: string) {
  return sql<ContractStatus>`case
    when contracts.valid_from > ${today} then 'upcoming'
    when contracts.valid_until is not null and contracts.valid_until < ${today} then 'ended'
    else 'current' end`;
}

function scopedContracts(db: Kysely<Database>, user: SessionUser) {
  return db
    .selectFrom("contracts")
    .innerJoin("organisations", "organisations.id", "contracts.organisation_id")
    .where(tenantScope(user, { organisation: "contracts.organisation_id" }));
}

const LIST_COLUMNS = [
  "contracts.id",
  "contracts.organisation_id",
  "organisations.name as organisation_name",
  "contracts.reference",
  "contracts.valid_from",
  "contracts.valid_until",
  "contracts.currency",
  "contracts.turnaround_standard_hours",
  "contracts.turnaround_express_hours",
] as const;

interface ListRowShape {
  id: number;
  organisation_id: number;
  organisation_name: string;
  reference: string;
  valid_from: string;
  valid_until: string | null;
  currency: string;
  turnaround_standard_hours: number;
  turnaround_express_hours: number;
}

function toListRow(row: ListRowShape, today: string): ContractListRow {
  return {
    id: row.id,
    organisationId: row.organisation_id,
    organisationName: row.organisation_name,
    reference: row.reference,
    validFrom: row.valid_from,
    validUntil: row.valid_until,
    status: contractStatus({ validFrom: row.valid_from, validUntil: row.valid_until }, today),
    currency: row.currency,
    turnaroundStandardHours: row.turnaround_standard_hours,
    turnaroundExpressHours: row.turnaround_express_hours,
  };
}

/** Contract versions in the caller's scope, paged, sorted and filtered; status by the unit's today. */
export async function listContracts(
  db: Kysely<Database>,
  user: SessionUser,
  query: ListContractsQuery,
  now = new Date(),
): Promise<Page<ContractListRow>> {
  const today = unitToday(now);
  let base = scopedContracts(db, user);
  if (query.q) base = base.where(searchTerm(["contracts.reference", "organisations.name"], query.q));
  if (query.organisationId) base = base.where("contracts.organisation_id", "=", query.organisationId);
  if (query.status) base = base.where(sql<boolean>`(${statusExpression(today)}) = ${query.status}`);
  const page = await fetchPage(
    base,
    (qb) => qb.select(LIST_COLUMNS).select(statusExpression(today).as("status")),
    query,
    SORT_COLUMNS[query.sort],
    "contracts.valid_from",
  );
  return { total: page.total, rows: page.rows.map((row) => toListRow(row, today)) };
}

/** Every version of one customer in the caller's scope, newest first. */
export async function listOrganisationContracts(
  db: Kysely<Database>,
  user: SessionUser,
  organisationId: number,
  now = new Date(),
): Promise<ContractListRow[]> {
  const today = unitToday(now);
  const rows = await scopedContracts(db, user)
    .select(LIST_COLUMNS)
    .where("contracts.organisation_id", "=", organisationId)
    .orderBy("contracts.valid_from", "desc")
    .execute();
  return rows.map((row) => toListRow(row, today));
}

/** The version in force today for the customer, else the next one to start, else the latest. */
export async function primaryContractFor(
  db: Kysely<Database>,
  user: SessionUser,
  organisationId: number,
  now = new Date(),
): Promise<ContractListRow | null> {
  const versions = await listOrganisationContracts(db, user, organisationId, now);
  const upcoming = versions.filter((v) => v.status === "upcoming");
  return versions.find((v) => v.status === "current") ?? upcoming.at(-1) ?? versions[0] ?? null;
}

async function loadRateCard(db: Kysely<Database>, contractId: number): Promise<{ rates: ClassRateView[]; surcharges: SurchargeRule[] }> {
  const bands = await db
    .selectFrom("contract_rates")
    .select(["set_class", "band_index", "up_to_quantity", "unit_price_minor"])
    .where("contract_id", "=", contractId)
    .orderBy("set_class")
    .orderBy("band_index")
    .execute();
  const byClass = new Map<string, VolumeBand[]>();
  for (const band of bands) {
    const list = byClass.get(band.set_class) ?? [];
    list.push({ upToQuantity: band.up_to_quantity, unitPriceMinor: band.unit_price_minor });
    byClass.set(band.set_class, list);
  }
  // Catalogue order first, then any class the catalogue no longer has.
  const order = [...SET_CLASSES, ...[...byClass.keys()].filter((c) => !isSetClass(c)).sort()];
  const rates = order
    .filter((setClass) => byClass.has(setClass))
    .map((setClass) => ({
      setClass,
      label: isSetClass(setClass) ? SET_CLASS_LABELS[setClass] : setClass,
      bands: byClass.get(setClass)!,
    }));

  const rows = await db
    .selectFrom("contract_surcharges")
    .select(["kind", "basis", "amount_minor", "basis_points"])
    .where("contract_id", "=", contractId)
    .execute();
  const surcharges = rows
    .filter((row): row is typeof row & { kind: SurchargeKind } => (SURCHARGE_KINDS as readonly string[]).includes(row.kind))
    .sort((a, b) => SURCHARGE_KINDS.indexOf(a.kind) - SURCHARGE_KINDS.indexOf(b.kind))
    .map(
      (row): SurchargeRule =>
        row.basis === "per_set"
          ? { kind: row.kind, basis: "per_set", amountMinor: row.amount_minor ?? 0 }
          : { kind: row.kind, basis: "percent_of_fee", basisPoints: row.basis_points ?? 0 },
    );
  return { rates, surcharges };
}

function parseCalendar(json: string): ServiceCalendar {
  return serviceCalendarSchema.parse(JSON.parse(json));
}

/** One version with its rate card and surcharges, in the caller's scope; 404 for anyone else's. */
export async function getContract(db: Kysely<Database>, user: SessionUser, id: number, now = new Date()): Promise<ContractDetail> {
  const row = await scopedContracts(db, user)
    .selectAll("contracts")
    .select("organisations.name as organisation_name")
    .where("contracts.id", "=", id)
    .executeTakeFirst();
  if (!row) throw notFound("That contract");
  const { rates, surcharges } = await loadRateCard(db, row.id);
  return {
    ...toListRow(row, unitToday(now)),
    vatCategory: row.vat_category === "Z" ? "Z" : "S",
    vatRateBasisPoints: row.vat_rate_bp,
    paymentTermsDays: row.payment_terms_days,
    clockStopsAt: row.clock_stops_at,
    serviceCalendar: parseCalendar(row.service_calendar),
    minimumMonthlyFeeMinor: row.minimum_monthly_fee_minor,
    slaCreditBasisPoints: row.sla_credit_bp,
    notes: row.notes,
    rates,
    surcharges,
    createdAt: row.created_at,
    updatedAt: row.updated_at,
  };
}

/** Customers a contract can be written for (active customer organisations). */
export async function listContractCustomers(db: Kysely<Database>, user: SessionUser): Promise<{ id: number; name: string; shortCode: string }[]> {
  const rows = await db
    .selectFrom("organisations")
    .select(["id", "name", "short_code"])
    .where("kind", "=", "customer")
    .where("active", "=", 1)
    .where(tenantScope(user, { organisation: "organisations.id" }))
    .orderBy("name")
    .execute();
  return rows.map((r) => ({ id: r.id, name: r.name, shortCode: r.short_code }));
}

/** Who changed a version and what changed, newest first (unit staff only see this). */
export async function contractHistory(db: Kysely<Database>, user: SessionUser, id: number): Promise<ContractHistoryEntry[]> {
  await getContract(db, user, id);
  const rows = await db
    .selectFrom("audit_log")
    .leftJoin("users", "users.id", "audit_log.actor_user_id")
    .select(["audit_log.id", "audit_log.at", "audit_log.action", "audit_log.details", "users.name as actor_name"])
    .where("audit_log.entity", "=", "contract")
    .where("audit_log.entity_id", "=", String(id))
    .orderBy("audit_log.id", "desc")
    .execute();
  return rows.map((row) => {
    const details = JSON.parse(row.details) as { changes?: Record<string, { before: unknown; after: unknown }> };
    return {
      id: row.id,
      at: row.at,
      action: row.action,
      actorName: row.actor_name,
      changes: Object.entries(details.changes ?? {}).map(([field, change]) => ({ field, ...change })),
    };
  });
}

// ——— Writing ———

/** The stored shape of a version, field by field, as the audit log records it. */
interface Snapshot {
  reference: string;
  validFrom: string;
  validUntil: string | null;
  currency: string;
  vatCategory: string;
  vatRateBasisPoints: number;
  paymentTermsDays: number;
  turnaroundStandardHours: number;
  turnaroundExpressHours: number;
  clockStopsAt: ClockStop;
  serviceCalendar: ServiceCalendar;
  minimumMonthlyFeeMinor: number;
  slaCreditBasisPoints: number;
  notes: string | null;
  rates: { setClass: string; bands: VolumeBand[] }[];
  surcharges: SurchargeRule[];
}

function snapshotOfInput(input: ContractVersionInput): Snapshot {
  const byClass = new Map(input.rates.map((rate) => [rate.setClass, rate]));
  return {
    reference: input.reference,
    validFrom: input.validFrom,
    validUntil: input.validUntil,
    currency: input.currency,
    vatCategory: input.vat.category,
    vatRateBasisPoints: input.vat.ratePercent,
    paymentTermsDays: input.paymentTermsDays,
    turnaroundStandardHours: input.turnaround.standardHours,
    turnaroundExpressHours: input.turnaround.expressHours,
    clockStopsAt: input.clockStopsAt,
    serviceCalendar: input.serviceCalendar,
    minimumMonthlyFeeMinor: input.minimumMonthlyFee,
    slaCreditBasisPoints: input.slaCreditPercent,
    notes: input.notes,
    rates: SET_CLASSES.filter((c) => byClass.has(c)).map((setClass) => ({
      setClass,
      bands: byClass.get(setClass)!.bands.map((b) => ({ upToQuantity: b.upToQuantity, unitPriceMinor: b.unitPrice })),
    })),
    surcharges: [...input.surcharges].sort((a, b) => SURCHARGE_KINDS.indexOf(a.kind) - SURCHARGE_KINDS.indexOf(b.kind)),
  };
}

function snapshotOfDetail(detail: ContractDetail): Snapshot {
  return {
    reference: detail.reference,
    validFrom: detail.validFrom,
    validUntil: detail.validUntil,
    currency: detail.currency,
    vatCategory: detail.vatCategory,
    vatRateBasisPoints: detail.vatRateBasisPoints,
    paymentTermsDays: detail.paymentTermsDays,
    turnaroundStandardHours: detail.turnaroundStandardHours,
    turnaroundExpressHours: detail.turnaroundExpressHours,
    clockStopsAt: detail.clockStopsAt,
    serviceCalendar: detail.serviceCalendar,
    minimumMonthlyFeeMinor: detail.minimumMonthlyFeeMinor,
    slaCreditBasisPoints: detail.slaCreditBasisPoints,
    notes: detail.notes,
    rates: detail.rates.map((rate) => ({ setClass: rate.setClass, bands: rate.bands })),
    surcharges: detail.surcharges,
  };
}

function diff(before: Snapshot, after: Snapshot): Record<string, { before: unknown; after: unknown }> {
  const changes: Record<string, { before: unknown; after: unknown }> = {};
  for (const key of Object.keys(after) as (keyof Snapshot)[]) {
    if (JSON.stringify(before[key]) !== JSON.stringify(after[key])) changes[key] = { before: before[key], after: after[key] };
  }
  return changes;
}

/** The terms a snapshot would price with; used to refuse anything the pricing engine would refuse. */
function termsOfSnapshot(snapshot: Snapshot, contractId: string, timeZone: string): ContractTerms {
  const validity = validityInstants(snapshot.validFrom, snapshot.validUntil, timeZone);
  return {
    contractId,
    validFrom: validity.validFrom,
    validTo: validity.validTo,
    currency: snapshot.currency,
    vat: { category: snapshot.vatCategory as VatCategoryCode, rateBasisPoints: snapshot.vatRateBasisPoints },
    paymentTermsDays: snapshot.paymentTermsDays,
    turnaroundHours: { standard: snapshot.turnaroundStandardHours, express: snapshot.turnaroundExpressHours },
    minimumMonthlyFeeMinor: snapshot.minimumMonthlyFeeMinor,
    slaCreditBasisPoints: snapshot.slaCreditBasisPoints,
    rateCard: {
      currency: snapshot.currency,
      classes: snapshot.rates.map((rate) => ({
        setClass: rate.setClass,
        label: isSetClass(rate.setClass) ? SET_CLASS_LABELS[rate.setClass] : rate.setClass,
        bands: rate.bands,
      })),
      surcharges: snapshot.surcharges,
    },
  };
}

function assertPriceable(snapshot: Snapshot): void {
  try {
    assertContractTerms(termsOfSnapshot(snapshot, snapshot.reference, unitTimeZone()));
  } catch (error) {
    if (error instanceof PricingError) {
      throw new AppError("validation", `These terms could not be priced: ${error.message}. Correct them and save again.`);
    }
    throw error;
  }
}

async function assertNoOverlap(
  trx: Kysely<Database>,
  organisationId: number,
  period: { validFrom: string; validUntil: string | null },
  excludeId: number | null,
): Promise<void> {
  let query = trx
    .selectFrom("contracts")
    .select(["id", "reference", "valid_from", "valid_until"])
    .where("organisation_id", "=", organisationId)
    .where((eb) => eb.or([eb("valid_until", "is", null), eb("valid_until", ">=", period.validFrom)]));
  if (period.validUntil !== null) query = query.where("valid_from", "<=", period.validUntil);
  if (excludeId !== null) query = query.where("id", "!=", excludeId);
  const clash = await query.orderBy("valid_from").executeTakeFirst();
  if (!clash) return;
  const dates = formatValidity(clash.valid_from, clash.valid_until);
  throw new AppError(
    "conflict",
    `These dates overlap version ${clash.reference}, valid ${dates}. Two versions of one customer may not share a day: ` +
      `end ${clash.reference} before this version starts, or change these dates.`,
    { validFrom: [`Overlaps ${clash.reference} (${dates}).`] },
  );
}

async function assertReferenceFree(trx: Kysely<Database>, reference: string, excludeId: number | null): Promise<void> {
  let query = trx.selectFrom("contracts").select("id").where("reference", "=", reference);
  if (excludeId !== null) query = query.where("id", "!=", excludeId);
  if (await query.executeTakeFirst()) {
    throw new AppError("conflict", `The reference ${reference} is already used by another contract version; choose another.`, {
      reference: ["Already used by another version."],
    });
  }
}

async function writeRateCard(trx: Kysely<Database>, contractId: number, snapshot: Snapshot): Promise<void> {
  await trx.deleteFrom("contract_rates").where("contract_id", "=", contractId).execute();
  await trx.deleteFrom("contract_surcharges").where("contract_id", "=", contractId).execute();
  const bands = snapshot.rates.flatMap((rate) =>
    rate.bands.map((band, index) => ({
      contract_id: contractId,
      set_class: rate.setClass,
      band_index: index,
      up_to_quantity: band.upToQuantity,
      unit_price_minor: band.unitPriceMinor,
    })),
  );
  if (bands.length > 0) await trx.insertInto("contract_rates").values(bands).execute();
  if (snapshot.surcharges.length > 0) {
    await trx
      .insertInto("contract_surcharges")
      .values(
        snapshot.surcharges.map((rule) => ({
          contract_id: contractId,
          kind: rule.kind,
          basis: rule.basis,
          amount_minor: rule.basis === "per_set" ? rule.amountMinor : null,
          basis_points: rule.basis === "percent_of_fee" ? rule.basisPoints : null,
        })),
      )
      .execute();
  }
}

function contractColumns(snapshot: Snapshot) {
  return {
    reference: snapshot.reference,
    valid_from: snapshot.validFrom,
    valid_until: snapshot.validUntil,
    currency: snapshot.currency,
    vat_category: snapshot.vatCategory,
    vat_rate_bp: snapshot.vatRateBasisPoints,
    payment_terms_days: snapshot.paymentTermsDays,
    turnaround_standard_hours: snapshot.turnaroundStandardHours,
    turnaround_express_hours: snapshot.turnaroundExpressHours,
    clock_stops_at: snapshot.clockStopsAt,
    service_calendar: JSON.stringify(snapshot.serviceCalendar),
    minimum_monthly_fee_minor: snapshot.minimumMonthlyFeeMinor,
    sla_credit_bp: snapshot.slaCreditBasisPoints,
    notes: snapshot.notes,
  };
}

/** Creates a contract version with its rate card; refuses overlapping dates (409) and writes nothing then. */
export async function createContract(
  db: Kysely<Database>,
  user: SessionUser,
  input: ContractVersionInput,
  now = new Date(),
): Promise<{ id: number }> {
  const snapshot = snapshotOfInput(input);
  assertPriceable(snapshot);
  return db.transaction().execute(async (trx) => {
    const org = await trx
      .selectFrom("organisations")
      .select(["id", "kind", "active"])
      .where("id", "=", input.organisationId)
      .where(tenantScope(user, { organisation: "organisations.id" }))
      .executeTakeFirst();
    if (!org || org.kind !== "customer" || !org.active) {
      throw new AppError("validation", "Choose one of the active customers.", { organisationId: ["Choose one of the active customers."] });
    }
    await assertReferenceFree(trx, snapshot.reference, null);
    await assertNoOverlap(trx, org.id, snapshot, null);
    const iso = now.toISOString();
    const { id } = await trx
      .insertInto("contracts")
      .values({ organisation_id: org.id, ...contractColumns(snapshot), created_by: user.id, created_at: iso, updated_at: iso })
      .returning("id")
      .executeTakeFirstOrThrow();
    await writeRateCard(trx, id, snapshot);
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: org.id,
        action: "contract.created",
        entity: "contract",
        entityId: id,
        details: { reference: snapshot.reference, validFrom: snapshot.validFrom, validUntil: snapshot.validUntil },
      },
      now,
    );
    return { id };
  });
}

/**
 * Corrects a version (also one that has started), auditing each changed field with its value
 * before and after. Returns the names of the changed fields; nothing is written when none changed.
 */
export async function updateContract(
  db: Kysely<Database>,
  user: SessionUser,
  id: number,
  input: ContractVersionInput,
  now = new Date(),
): Promise<{ id: number; changed: string[] }> {
  const after = snapshotOfInput(input);
  assertPriceable(after);
  return db.transaction().execute(async (trx) => {
    const existing = await getContract(trx, user, id, now);
    if (input.organisationId !== existing.organisationId) {
      throw new AppError("validation", "A version stays with its customer; write a new version for another customer.", {
        organisationId: [`This version belongs to ${existing.organisationName}.`],
      });
    }
    const changes = diff(snapshotOfDetail(existing), after);
    const changed = Object.keys(changes);
    if (changed.length === 0) return { id, changed };
    await assertReferenceFree(trx, after.reference, id);
    await assertNoOverlap(trx, existing.organisationId, after, id);
    await trx
      .updateTable("contracts")
      .set({ ...contractColumns(after), updated_at: now.toISOString() })
      .where("id", "=", id)
      .execute();
    if (changes.rates || changes.surcharges) await writeRateCard(trx, id, after);
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: existing.organisationId,
        action: "contract.updated",
        entity: "contract",
        entityId: id,
        details: { reference: after.reference, statusAtChange: existing.status, changes },
      },
      now,
    );
    return { id, changed };
  });
}

/** Sets the last day of a version (ending an open-ended one, or moving its end); audited. */
export async function endContract(
  db: Kysely<Database>,
  user: SessionUser,
  input: { id: number; validUntil: string },
  now = new Date(),
): Promise<{ id: number }> {
  return db.transaction().execute(async (trx) => {
    const existing = await getContract(trx, user, input.id, now);
    if (input.validUntil < existing.validFrom) {
      throw new AppError("validation", `The last day cannot be before the first day of ${existing.reference} (${existing.validFrom}).`, {
        validUntil: [`Choose ${existing.validFrom} or later.`],
      });
    }
    if (input.validUntil === existing.validUntil) return { id: existing.id };
    await assertNoOverlap(trx, existing.organisationId, { validFrom: existing.validFrom, validUntil: input.validUntil }, existing.id);
    await trx
      .updateTable("contracts")
      .set({ valid_until: input.validUntil, updated_at: now.toISOString() })
      .where("id", "=", existing.id)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: existing.organisationId,
        action: "contract.ended",
        entity: "contract",
        entityId: existing.id,
        details: {
          reference: existing.reference,
          statusAtChange: existing.status,
          changes: { validUntil: { before: existing.validUntil, after: input.validUntil } },
        },
      },
      now,
    );
    return { id: existing.id };
  });
}

// ——— Terms for billing and ordering ———

type ContractRow = Selectable<ContractsTable>;

async function termsOfRow(db: Kysely<Database>, row: ContractRow, timeZone: string): Promise<ContractTermsInForce> {
  const { rates, surcharges } = await loadRateCard(db, row.id);
  const validity = validityInstants(row.valid_from, row.valid_until, timeZone);
  return {
    contractId: row.reference,
    validFrom: validity.validFrom,
    validTo: validity.validTo,
    currency: row.currency,
    vat: { category: row.vat_category as VatCategoryCode, rateBasisPoints: row.vat_rate_bp },
    paymentTermsDays: row.payment_terms_days,
    turnaroundHours: { standard: row.turnaround_standard_hours, express: row.turnaround_express_hours },
    minimumMonthlyFeeMinor: row.minimum_monthly_fee_minor,
    slaCreditBasisPoints: row.sla_credit_bp,
    rateCard: { currency: row.currency, classes: rates, surcharges },
    id: row.id,
    organisationId: row.organisation_id,
    reference: row.reference,
    validFromDate: row.valid_from,
    validUntilDate: row.valid_until,
    serviceCalendar: parseCalendar(row.service_calendar),
    clockStopsAt: row.clock_stops_at,
  };
}

/**
 * The version of the customer's contract in force at an instant (the local date of `at` in the
 * unit's time zone lies within its validity), or null when none is. For the billing and ordering
 * code, which has already checked who may see the customer; it reads no tenant scope itself.
 */
export async function contractTermsFor(
  db: Kysely<Database>,
  organisationId: number,
  at: Date,
  timeZone = unitTimeZone(),
): Promise<ContractTermsInForce | null> {
  const day = localDateOf(parseInstant(at, "at"), timeZone);
  const row = await db
    .selectFrom("contracts")
    .selectAll()
    .where("organisation_id", "=", organisationId)
    .where("valid_from", "<=", day)
    .where((eb) => eb.or([eb("valid_until", "is", null), eb("valid_until", ">=", day)]))
    .executeTakeFirst();
  return row ? termsOfRow(db, row, timeZone) : null;
}

/**
 * Every version in force at some instant of the half-open period [start, end), in order, for a
 * billing month that a change of version splits: price each part under its own terms.
 */
export async function contractTermsBetween(
  db: Kysely<Database>,
  organisationId: number,
  period: { start: Date | string; end: Date | string },
  timeZone = unitTimeZone(),
): Promise<ContractTermsInForce[]> {
  const start = parseInstant(period.start, "period start");
  const end = parseInstant(period.end, "period end");
  if (end <= start) return [];
  const firstDay = localDateOf(start, timeZone);
  // The last instant of the period is 1 ms before its end.
  const lastDay = localDateOf(new Date(end.getTime() - 1), timeZone);
  const rows = await db
    .selectFrom("contracts")
    .selectAll()
    .where("organisation_id", "=", organisationId)
    .where("valid_from", "<=", lastDay)
    .where((eb) => eb.or([eb("valid_until", "is", null), eb("valid_until", ">=", firstDay)]))
    .orderBy("valid_from")
    .execute();
  return Promise.all(rows.map((row) => termsOfRow(db, row, timeZone)));
}

