import "server-only";
import { type Kysely, sql } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { isSetClass, SET_CLASS_LABELS } from "@/lib/catalogue/vocabulary";
import { AppError, notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { Gs1Error, parseScan } from "@/lib/labels/gs1";
import { allocateSetIdentifiers, isSetIdentifierCollision } from "./allocator";
import { normaliseTypedCode, setHumanReadable } from "./identifiers";
import type { ListSetsQuery, SetStatus } from "./schemas";

// Sets: the physical, barcoded instances of a set type. Adding them in batches, listing and
// reading them in the caller's tenant scope, retiring and returning them, and finding one from
// what a scanner sent.

export interface SetListRow {
  id: number;
  serial: string;
  giai: string;
  status: SetStatus;
  setTypeId: number;
  setTypeCode: string;
  setTypeName: string;
  setClass: string;
  setClassLabel: string;
  organisationId: number;
  organisationName: string;
  homeSiteId: number;
  homeSiteName: string;
  contentsLines: number;
  contentsInstruments: number;
  createdAt: string;
}

export interface SetView extends SetListRow {
  humanReadable: string;
  organisationShortCode: string;
  packaging: string;
  sterilisationMethod: string;
  setTypeActive: boolean;
  notes: string | null;
  updatedAt: string;
}

const SORT_COLUMNS = {
  serial: "sets.serial",
  set_type: "set_types.name",
  organisation: "organisations.name",
  home_site: "sites.name",
  status: "sets.status",
  created_at: "sets.created_at",
} as const;

// Every read of sets starts here: the caller's organisation, and clinic staff only the sets whose
// home is their own site.
function scopedSets(db: Kysely<Database>, user: SessionUser) {
  return db
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .innerJoin("organisations", "organisations.id", "sets.organisation_id")
    .innerJoin("sites", "sites.id", "sets.home_site_id")
    .where(tenantScope(user, { organisation: "sets.organisation_id", site: "sets.home_site_id" }));
}

type ScopedSets = ReturnType<typeof scopedSets>;

function selectColumns(qb: ScopedSets) {
  return qb.select([
    "sets.id",
    "sets.serial",
    "sets.giai",
    "sets.status",
    "sets.notes",
    "sets.created_at",
    "sets.updated_at",
    "sets.set_type_id",
    "set_types.code as set_type_code",
    "set_types.name as set_type_name",
    "set_types.set_class",
    "set_types.packaging",
    "set_types.sterilisation_method",
    "set_types.active as set_type_active",
    "sets.organisation_id",
    "organisations.name as organisation_name",
    "organisations.short_code as organisation_short_code",
    "sets.home_site_id",
    "sites.name as home_site_name",
    sql<number>`(select count(*) from set_type_items i where i.set_type_id = sets.set_type_id)`.as("contents_lines"),
    sql<number>`(select coalesce(sum(i.quantity), 0) from set_type_items i where i.set_type_id = sets.set_type_id)`.as(
      "contents_instruments",
    ),
  ]);
}

type Row = Awaited<ReturnType<ReturnType<typeof selectColumns>["executeTakeFirstOrThrow"]>>;

function toListRow(r: Row): SetListRow {
  return {
    id: r.id,
    serial: r.serial,
    giai: r.giai,
    status: r.status,
    setTypeId: r.set_type_id,
    setTypeCode: r.set_type_code,
    setTypeName: r.set_type_name,
    setClass: r.set_class,
    setClassLabel: isSetClass(r.set_class) ? SET_CLASS_LABELS[r.set_class] : r.set_class,
    organisationId: r.organisation_id,
    organisationName: r.organisation_name,
    homeSiteId: r.home_site_id,
    homeSiteName: r.home_site_name,
    contentsLines: Number(r.contents_lines),
    contentsInstruments: Number(r.contents_instruments),
    createdAt: r.created_at,
  };
}

function toView(r: Row): SetView {
  return {
    ...toListRow(r),
    humanReadable: setHumanReadable(r.giai),
    organisationShortCode: r.organisation_short_code,
    packaging: r.packaging,
    sterilisationMethod: r.sterilisation_method,
    setTypeActive: r.set_type_active === 1,
    notes: r.notes,
    updatedAt: r.updated_at,
  };
}

/** The caller's sets, paged, sorted and filtered; filters outside the scope simply match nothing. */
export async function listSets(db: Kysely<Database>, user: SessionUser, query: ListSetsQuery): Promise<Page<SetListRow>> {
  let base = scopedSets(db, user);
  if (query.q) base = base.where(searchTerm(["sets.serial", "sets.giai", "set_types.name", "set_types.code"], query.q));
  if (query.organisationId) base = base.where("sets.organisation_id", "=", query.organisationId);
  if (query.siteId) base = base.where("sets.home_site_id", "=", query.siteId);
  if (query.setTypeId) base = base.where("sets.set_type_id", "=", query.setTypeId);
  if (query.status) base = base.where("sets.status", "=", query.status);
  const page = await fetchPage(base, selectColumns, query, SORT_COLUMNS[query.sort], "sets.id");
  return { total: page.total, rows: page.rows.map(toListRow) };
}

/** One set in the caller's scope, or 404. */
export async function getSet(db: Kysely<Database>, user: SessionUser, id: number): Promise<SetView> {
  const row = await selectColumns(scopedSets(db, user)).where("sets.id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That set");
  return toView(row);
}

export interface SetContentsLine {
  position: number;
  name: string;
  quantity: number;
}

/** The contents list of a set (its set type's), in the caller's scope, or 404. */
export async function getSetContents(db: Kysely<Database>, user: SessionUser, id: number): Promise<SetContentsLine[]> {
  const set = await getSet(db, user, id);
  return db
    .selectFrom("set_type_items")
    .select(["position", "name", "quantity"])
    .where("set_type_id", "=", set.setTypeId)
    .orderBy("position")
    .orderBy("id")
    .execute();
}

export interface SetAuditEntry {
  id: number;
  at: string;
  action: string;
  actorName: string | null;
  details: Record<string, unknown>;
}

/** What was recorded about one set, oldest first; 404 when the set is outside the scope. */
export async function listSetAuditEntries(db: Kysely<Database>, user: SessionUser, id: number): Promise<SetAuditEntry[]> {
  const set = await getSet(db, user, id);
  const rows = await db
    .selectFrom("audit_log")
    .leftJoin("users", "users.id", "audit_log.actor_user_id")
    .select(["audit_log.id", "audit_log.at", "audit_log.action", "audit_log.details", "users.name as actor_name"])
    .where("audit_log.entity", "=", "set")
    .where("audit_log.entity_id", "=", String(set.id))
    .orderBy("audit_log.at")
    .orderBy("audit_log.id")
    .execute();
  return rows.map((r) => ({ id: r.id, at: r.at, action: r.action, actorName: r.actor_name, details: parseDetails(r.details) }));
}

function parseDetails(text: string): Record<string, unknown> {
  try {
    const value: unknown = JSON.parse(text);
    return value && typeof value === "object" && !Array.isArray(value) ? (value as Record<string, unknown>) : {};
  } catch {
    return {};
  }
}

// ---------------------------------------------------------------------------------------------
// Adding sets

export interface CreateSetsCommand {
  organisationId: number;
  setTypeId: number;
  homeSiteId: number;
  count: number;
}

export interface CreatedSets {
  sets: { id: number; serial: string; giai: string }[];
}

/** Attempts at a batch when another one took the same numbers at the same moment. */
const ALLOCATION_ATTEMPTS = 3;

/**
 * Adds `count` sets of a set type at a home site, numbered on from the customer's last set, with
 * one audit entry per set, all in one transaction. The set type and the site must belong to the
 * customer; anything else is refused and nothing is written.
 */
export async function createSets(
  db: Kysely<Database>,
  caller: SessionUser,
  input: CreateSetsCommand,
  now = new Date(),
): Promise<CreatedSets> {
  for (let attempt = 1; ; attempt++) {
    try {
      return await createSetsOnce(db, caller, input, now);
    } catch (error) {
      if (!isSetIdentifierCollision(error)) throw error;
      if (attempt >= ALLOCATION_ATTEMPTS) {
        throw new AppError(
          "conflict",
          "Someone else was adding sets for this customer at the same moment and took the same numbers. Nothing was saved; try again.",
        );
      }
    }
  }
}

async function createSetsOnce(
  db: Kysely<Database>,
  caller: SessionUser,
  input: CreateSetsCommand,
  now: Date,
): Promise<CreatedSets> {
  return db.transaction().execute(async (trx) => {
    const org = await trx
      .selectFrom("organisations")
      .select(["id", "name", "short_code", "kind", "active"])
      .where("id", "=", input.organisationId)
      .where(tenantScope(caller, { organisation: "organisations.id" }))
      .executeTakeFirst();
    if (!org) throw notFound("That customer");
    if (org.kind !== "customer") {
      throw new AppError("validation", "Sets belong to a customer.", { organisationId: ["Choose one of the customers."] });
    }
    if (!org.active) {
      throw new AppError("validation", `${org.name} is switched off; switch it on before adding sets.`, {
        organisationId: ["This customer is switched off."],
      });
    }

    const setType = await trx
      .selectFrom("set_types")
      .select(["id", "organisation_id", "name", "active"])
      .where("id", "=", input.setTypeId)
      .where(tenantScope(caller, { organisation: "set_types.organisation_id" }))
      .executeTakeFirst();
    if (!setType) throw notFound("That set type");
    if (setType.organisation_id !== org.id) {
      throw new AppError("validation", `That set type is not in ${org.name}'s catalogue.`, {
        setTypeId: [`Choose one of ${org.name}'s set types.`],
      });
    }
    if (!setType.active) {
      throw new AppError("validation", `${setType.name} is withdrawn from the catalogue; no new sets can be added.`, {
        setTypeId: ["This set type is withdrawn."],
      });
    }

    const site = await trx
      .selectFrom("sites")
      .select(["id", "organisation_id", "name", "active", "is_depot"])
      .where("id", "=", input.homeSiteId)
      .where(tenantScope(caller, { organisation: "sites.organisation_id", site: "sites.id" }))
      .executeTakeFirst();
    if (!site) throw notFound("That site");
    if (site.organisation_id !== org.id || site.is_depot === 1) {
      throw new AppError("validation", `That site is not one of ${org.name}'s.`, {
        homeSiteId: [`Choose one of ${org.name}'s sites.`],
      });
    }
    if (!site.active) {
      throw new AppError("validation", `${site.name} is closed; choose an open site.`, { homeSiteId: ["This site is closed."] });
    }

    const identifiers = await allocateSetIdentifiers(trx, { id: org.id, shortCode: org.short_code }, input.count);
    const iso = now.toISOString();
    const created = await trx
      .insertInto("sets")
      .values(
        identifiers.map(({ serial, giai }) => ({
          organisation_id: org.id,
          set_type_id: setType.id,
          home_site_id: site.id,
          serial,
          giai,
          status: "in_service" as const,
          notes: null,
          created_at: iso,
          updated_at: iso,
        })),
      )
      .returning(["id", "serial", "giai"])
      .execute();
    for (const set of created) {
      await recordAudit(
        trx,
        {
          actorUserId: caller.id,
          organisationId: org.id,
          action: "set.created",
          entity: "set",
          entityId: set.id,
          details: { serial: set.serial, giai: set.giai, setTypeId: setType.id, homeSiteId: site.id, batchSize: created.length },
        },
        now,
      );
    }
    return { sets: created };
  });
}

// ---------------------------------------------------------------------------------------------
// Retiring and returning to service

/** Retires a set or returns it to service, with the reason in the audit log. */
export async function changeSetStatus(
  db: Kysely<Database>,
  caller: SessionUser,
  input: { setId: number; status: SetStatus; reason: string },
  now = new Date(),
): Promise<SetView> {
  return db.transaction().execute(async (trx) => {
    const set = await getSet(trx, caller, input.setId);
    if (set.status === input.status) {
      throw new AppError(
        "conflict",
        input.status === "retired" ? `${set.serial} is already retired.` : `${set.serial} is already in service.`,
      );
    }
    const updated = await trx
      .updateTable("sets")
      .set({ status: input.status, updated_at: now.toISOString() })
      .where("id", "=", set.id)
      .where("status", "=", set.status)
      .executeTakeFirst();
    if (Number(updated.numUpdatedRows) !== 1) {
      throw new AppError("conflict", `${set.serial} was changed by someone else just now. Reload the page and try again.`);
    }
    await recordAudit(
      trx,
      {
        actorUserId: caller.id,
        organisationId: set.organisationId,
        action: input.status === "retired" ? "set.retired" : "set.returned_to_service",
        entity: "set",
        entityId: set.id,
        details: { reason: input.reason, from: set.status, to: input.status },
      },
      now,
    );
    return getSet(trx, caller, set.id);
  });
}

// ---------------------------------------------------------------------------------------------
// Scans

/**
 * The set a station scanned or someone typed, in the caller's scope: a GS1 scan carrying a
 * GIAI (8004), or typed text matching a serial ("QMH-000123"), an asset reference ("QMH000123")
 * or a whole GIAI. Other barcodes get an error that says what was scanned instead.
 */
export async function findSetByScan(db: Kysely<Database>, user: SessionUser, raw: string): Promise<SetView> {
  let scan: ReturnType<typeof parseScan>;
  try {
    scan = parseScan(raw);
  } catch (error) {
    if (error instanceof Gs1Error) {
      throw new AppError("validation", `That scan could not be read: ${error.message}. Scan the set's label again, or type its serial.`, {
        code: [error.message],
      });
    }
    throw error;
  }
  let query = selectColumns(scopedSets(db, user));
  let shown: string;
  switch (scan.kind) {
    case "set":
      query = query.where("sets.giai", "=", scan.giai);
      shown = setHumanReadable(scan.giai);
      break;
    case "typed": {
      const code = normaliseTypedCode(scan.code);
      query = query.where((eb) =>
        eb.or([eb("sets.serial", "=", code), eb("sets.giai", "=", code), eb(sql<string>`replace(sets.serial, '-', '')`, "=", code)]),
      );
      shown = code;
      break;
    }
    case "gtin":
      throw new AppError("validation", `That is a product barcode (GTIN ${scan.gtin}), not a set's label. Scan the label on the set.`, {
        code: ["Not a set label."],
      });
    case "sscc":
      throw new AppError("validation", `That is a shipping unit's code (SSCC ${scan.sscc}), not a set's label. Scan the label on the set.`, {
        code: ["Not a set label."],
      });
    default:
      throw new AppError("validation", "That GS1 code carries no set identifier (AI 8004). Scan the label on the set.", {
        code: ["Not a set label."],
      });
  }
  const row = await query.executeTakeFirst();
  if (!row) throw new AppError("not_found", `No set with the code ${shown} is among your sets.`);
  return toView(row);
}

// ---------------------------------------------------------------------------------------------
// Options for the forms and filters

export interface SetCustomerOption {
  id: number;
  name: string;
  active: boolean;
  sites: { id: number; name: string; active: boolean }[];
  setTypes: { id: number; code: string; name: string; setClassLabel: string; active: boolean }[];
}

/** The customers, their sites and set types the caller may see: the filters' and the dialog's choices. */
export async function setCustomerOptions(db: Kysely<Database>, user: SessionUser): Promise<SetCustomerOption[]> {
  const orgs = await db
    .selectFrom("organisations")
    .select(["id", "name", "active"])
    .where("kind", "=", "customer")
    .where(tenantScope(user, { organisation: "organisations.id" }))
    .orderBy("name")
    .execute();
  const sites = await db
    .selectFrom("sites")
    .select(["id", "name", "active", "organisation_id"])
    .where("is_depot", "=", 0)
    .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }))
    .orderBy("name")
    .execute();
  const setTypes = await db
    .selectFrom("set_types")
    .select(["id", "code", "name", "set_class", "active", "organisation_id"])
    .where(tenantScope(user, { organisation: "set_types.organisation_id" }))
    .orderBy("name")
    .execute();
  return orgs.map((o) => ({
    id: o.id,
    name: o.name,
    active: o.active === 1,
    sites: sites.filter((s) => s.organisation_id === o.id).map((s) => ({ id: s.id, name: s.name, active: s.active === 1 })),
    setTypes: setTypes
      .filter((t) => t.organisation_id === o.id)
      .map((t) => ({
        id: t.id,
        code: t.code,
        name: t.name,
        setClassLabel: isSetClass(t.set_class) ? SET_CLASS_LABELS[t.set_class] : t.set_class,
        active: t.active === 1,
      })),
  }));
}
