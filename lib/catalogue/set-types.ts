import "server-only";
import { type Kysely, sql } from "kysely";
import { uniqueViolation } from "@/db/dialect";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { isCustomerRole } from "@/lib/auth/roles";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError, notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { describeChanges, type SetTypeValues } from "./compare";
import type { ListSetTypesQuery, SetTypeFields } from "./schemas";
import { expectsIfu, type Packaging, PROCESSING_FLAGS, type ProcessingFlag, type SetClass, type SterilisationMethod } from "./vocabulary";

// The set catalogue: set types of each customer organisation with their contents lists. Every
// query carries the caller's tenant scope in its WHERE clause; every write is audited in the
// transaction that makes it.

type Db = Kysely<Database>;

export interface CustomerOption {
  id: number;
  name: string;
  shortCode: string;
  setTypeCount: number;
}

export interface SetTypeListRow {
  id: number;
  organisationId: number;
  organisationName: string;
  code: string;
  name: string;
  setClass: SetClass;
  packaging: Packaging;
  sterilisationMethod: SterilisationMethod;
  flags: ProcessingFlag[];
  weightG: number;
  sizeStu: number;
  itemCount: number;
  instrumentCount: number;
  hasIfu: boolean;
  active: boolean;
  updatedAt: string;
}

export interface SetTypeDetail extends SetTypeListRow {
  processingNotes: string | null;
  items: { position: number; name: string; quantity: number }[];
  ifu: { id: number; name: string; sizeBytes: number; uploadedAt: string } | null;
  /** A loaner set without its instructions for use: bookings refuse it. */
  missingIfu: boolean;
  createdAt: string;
}

const SORT_COLUMNS = {
  code: "set_types.code",
  name: "set_types.name",
  set_class: "set_types.set_class",
  packaging: "set_types.packaging",
  method: "set_types.sterilisation_method",
  weight: "set_types.weight_g",
  size: "set_types.size_stu",
  items: "instrument_count",
  updated_at: "set_types.updated_at",
} as const;

/** The customer organisations whose catalogues the caller may see (its own, for clinic users). */
export async function listCatalogueCustomers(db: Db, user: SessionUser): Promise<CustomerOption[]> {
  const rows = await db
    .selectFrom("organisations")
    .select((eb) => [
      "organisations.id",
      "organisations.name",
      "organisations.short_code",
      eb
        .selectFrom("set_types")
        .select((e) => e.fn.countAll<number>().as("n"))
        .whereRef("set_types.organisation_id", "=", "organisations.id")
        .where("set_types.active", "=", 1)
        .as("set_type_count"),
    ])
    .where("organisations.kind", "=", "customer")
    .where("organisations.active", "=", 1)
    .where(tenantScope(user, { organisation: "organisations.id" }))
    .orderBy("organisations.name")
    .execute();
  return rows.map((r) => ({ id: r.id, name: r.name, shortCode: r.short_code, setTypeCount: Number(r.set_type_count ?? 0) }));
}

function scopedSetTypes(db: Db, user: SessionUser) {
  return db
    .selectFrom("set_types")
    .innerJoin("organisations", "organisations.id", "set_types.organisation_id")
    .where(tenantScope(user, { organisation: "set_types.organisation_id" }));
}

function selectListColumns(qb: ReturnType<typeof scopedSetTypes>) {
  return qb.select((eb) => [
    "set_types.id",
    "set_types.organisation_id",
    "organisations.name as organisation_name",
    "set_types.code",
    "set_types.name",
    "set_types.set_class",
    "set_types.packaging",
    "set_types.sterilisation_method",
    "set_types.processing_flags",
    "set_types.processing_notes",
    "set_types.weight_g",
    "set_types.size_stu",
    "set_types.ifu_file_id",
    "set_types.active",
    "set_types.created_at",
    "set_types.updated_at",
    eb
      .selectFrom("set_type_items")
      .select((e) => e.fn.countAll<number>().as("n"))
      .whereRef("set_type_items.set_type_id", "=", "set_types.id")
      .as("item_count"),
    eb
      .selectFrom("set_type_items")
      .select(sql<number>`coalesce(sum(set_type_items.quantity), 0)`.as("q"))
      .whereRef("set_type_items.set_type_id", "=", "set_types.id")
      .as("instrument_count"),
  ]);
}

type ListRow = Awaited<ReturnType<ReturnType<typeof selectListColumns>["executeTakeFirstOrThrow"]>>;

/** The stored flags, read defensively: unknown words are dropped rather than shown. */
export function parseFlags(json: string): ProcessingFlag[] {
  try {
    const value: unknown = JSON.parse(json);
    if (!Array.isArray(value)) return [];
    return PROCESSING_FLAGS.filter((f) => value.includes(f));
  } catch {
    return [];
  }
}

function toListRow(r: ListRow): SetTypeListRow {
  return {
    id: r.id,
    organisationId: r.organisation_id,
    organisationName: r.organisation_name,
    code: r.code,
    name: r.name,
    setClass: r.set_class as SetClass,
    packaging: r.packaging,
    sterilisationMethod: r.sterilisation_method,
    flags: parseFlags(r.processing_flags),
    weightG: r.weight_g,
    sizeStu: r.size_stu,
    itemCount: Number(r.item_count ?? 0),
    instrumentCount: Number(r.instrument_count ?? 0),
    hasIfu: r.ifu_file_id !== null,
    active: r.active === 1,
    updatedAt: r.updated_at,
  };
}

/**
 * One page of set types. Unit staff name the organisation (or see every customer's); for clinic
 * users it is always their own, whatever the query says.
 */
export async function listSetTypes(db: Db, user: SessionUser, query: ListSetTypesQuery): Promise<Page<SetTypeListRow>> {
  const organisationId = isCustomerRole(user.role) ? user.organisationId : query.organisationId;
  let base = scopedSetTypes(db, user);
  if (organisationId) base = base.where("set_types.organisation_id", "=", organisationId);
  if (query.q) base = base.where(searchTerm(["set_types.code", "set_types.name"], query.q));
  if (query.setClass) base = base.where("set_types.set_class", "=", query.setClass);
  if (query.packaging) base = base.where("set_types.packaging", "=", query.packaging);
  if (query.method) base = base.where("set_types.sterilisation_method", "=", query.method);
  if (query.status !== "all") base = base.where("set_types.active", "=", query.status === "active" ? 1 : 0);
  const page = await fetchPage(base, selectListColumns, query, SORT_COLUMNS[query.sort], "set_types.id");
  return { total: page.total, rows: page.rows.map(toListRow) };
}

/** One set type with its contents and IFU, or 404 when it does not exist or is another tenant's. */
export async function getSetType(db: Db, user: SessionUser, id: number): Promise<SetTypeDetail> {
  const row = await selectListColumns(scopedSetTypes(db, user)).where("set_types.id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That set type");
  const items = await db
    .selectFrom("set_type_items")
    .select(["position", "name", "quantity"])
    .where("set_type_id", "=", row.id)
    .orderBy("position")
    .execute();
  const ifu =
    row.ifu_file_id === null
      ? undefined
      : await db
          .selectFrom("files")
          .select(["id", "original_name", "size_bytes", "created_at"])
          .where("id", "=", row.ifu_file_id)
          .where("organisation_id", "=", row.organisation_id)
          .executeTakeFirst();
  const base = toListRow(row);
  return {
    ...base,
    hasIfu: !!ifu,
    processingNotes: row.processing_notes,
    items,
    ifu: ifu ? { id: ifu.id, name: ifu.original_name, sizeBytes: ifu.size_bytes, uploadedAt: ifu.created_at } : null,
    missingIfu: expectsIfu(base.setClass) && !ifu,
    createdAt: row.created_at,
  };
}

/** The values of a stored set type, to compare with an edited or imported version. */
export function valuesOf(detail: Pick<SetTypeDetail, keyof SetTypeValues>): SetTypeValues {
  return {
    code: detail.code,
    name: detail.name,
    setClass: detail.setClass,
    packaging: detail.packaging,
    sterilisationMethod: detail.sterilisationMethod,
    flags: detail.flags,
    processingNotes: detail.processingNotes,
    weightG: detail.weightG,
    sizeStu: detail.sizeStu,
    items: detail.items.map((i) => ({ name: i.name, quantity: i.quantity })),
  };
}

/** A customer organisation the caller may edit the catalogue of, or 404. */
export async function catalogueOrganisation(db: Db, user: SessionUser, organisationId: number) {
  const org = await db
    .selectFrom("organisations")
    .select(["id", "name", "kind", "active"])
    .where("id", "=", organisationId)
    .where(tenantScope(user, { organisation: "organisations.id" }))
    .executeTakeFirst();
  if (!org || org.kind !== "customer" || !org.active) throw notFound("That customer");
  return org;
}

/** 409 with the field when another set type of the organisation already has the code or name. */
export async function assertUnique(
  db: Db,
  organisationId: number,
  values: { code: string; name: string },
  exceptId: number | null,
): Promise<void> {
  const clash = await db
    .selectFrom("set_types")
    .select(["id", "code", "name"])
    .where("organisation_id", "=", organisationId)
    .where((eb) => eb.or([eb("code", "=", values.code), eb(sql<string>`lower(name)`, "=", values.name.toLowerCase())]))
    .$if(exceptId !== null, (qb) => qb.where("id", "!=", exceptId!))
    .execute();
  const fields: Record<string, string[]> = {};
  const byCode = clash.find((c) => c.code === values.code);
  const byName = clash.find((c) => c.name.toLowerCase() === values.name.toLowerCase());
  if (byCode) fields.code = [`Set type ${byCode.code} (${byCode.name}) already has this code.`];
  if (byName) fields.name = [`Set type ${byName.code} already has this name.`];
  if (byCode || byName) {
    throw new AppError("conflict", "Another set type of this customer already has this " + (byCode && byName ? "code and name." : byCode ? "code." : "name."), fields);
  }
}

/** The IFU must be an uploaded "ifu" file of the same organisation. */
async function assertIfu(db: Db, organisationId: number, fileId: number | null): Promise<void> {
  if (fileId === null) return;
  const file = await db
    .selectFrom("files")
    .select(["id", "purpose"])
    .where("id", "=", fileId)
    .where("organisation_id", "=", organisationId)
    .executeTakeFirst();
  if (!file || file.purpose !== "ifu") {
    throw new AppError("validation", "The instructions for use must be a PDF uploaded for this customer.", {
      ifuFileId: ["Upload the PDF again for this customer."],
    });
  }
}

/** Replaces the contents list of a set type (positions 1, 2, …). */
export async function writeItems(db: Db, setTypeId: number, items: readonly { name: string; quantity: number }[]): Promise<void> {
  await db.deleteFrom("set_type_items").where("set_type_id", "=", setTypeId).execute();
  if (items.length === 0) return;
  await db
    .insertInto("set_type_items")
    .values(items.map((item, index) => ({ set_type_id: setTypeId, position: index + 1, name: item.name, quantity: item.quantity })))
    .execute();
}

/** Column values of a set type as the database keeps them. */
export function setTypeColumns(values: SetTypeValues) {
  return {
    code: values.code,
    name: values.name,
    set_class: values.setClass,
    packaging: values.packaging,
    sterilisation_method: values.sterilisationMethod,
    processing_flags: JSON.stringify(values.flags),
    processing_notes: values.processingNotes,
    weight_g: values.weightG,
    size_stu: values.sizeStu,
  };
}

function valuesFromFields(fields: SetTypeFields): SetTypeValues {
  return {
    code: fields.code,
    name: fields.name,
    setClass: fields.setClass,
    packaging: fields.packaging,
    sterilisationMethod: fields.sterilisationMethod,
    flags: fields.flags,
    processingNotes: fields.processingNotes,
    weightG: fields.weightG,
    sizeStu: fields.sizeStu,
    items: fields.items,
  };
}

/** Turns a unique-constraint failure that slipped past the checks (a race) into a 409. */
async function uniqueAsConflict<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (error) {
    if (uniqueViolation(error)) {
      throw new AppError("conflict", "Another set type of this customer already has this code or name. Reload and try again.");
    }
    throw error;
  }
}

/** Creates a set type with its contents list. */
export async function createSetType(
  db: Db,
  user: SessionUser,
  input: SetTypeFields & { organisationId: number },
  now = new Date(),
): Promise<{ id: number }> {
  return uniqueAsConflict(() =>
    db.transaction().execute(async (trx) => {
      const org = await catalogueOrganisation(trx, user, input.organisationId);
      await assertUnique(trx, org.id, input, null);
      await assertIfu(trx, org.id, input.ifuFileId);
      const iso = now.toISOString();
      const { id } = await trx
        .insertInto("set_types")
        .values({
          organisation_id: org.id,
          ...setTypeColumns(valuesFromFields(input)),
          ifu_file_id: input.ifuFileId,
          created_at: iso,
          updated_at: iso,
        })
        .returning("id")
        .executeTakeFirstOrThrow();
      await writeItems(trx, id, input.items);
      await recordAudit(
        trx,
        {
          actorUserId: user.id,
          organisationId: org.id,
          action: "set_type.created",
          entity: "set_type",
          entityId: id,
          details: { code: input.code, name: input.name, items: input.items.length, ifuFileId: input.ifuFileId },
        },
        now,
      );
      return { id };
    }),
  );
}

/** Updates a set type and replaces its contents list, in one transaction. */
export async function updateSetType(
  db: Db,
  user: SessionUser,
  input: SetTypeFields & { setTypeId: number },
  now = new Date(),
): Promise<{ id: number; changes: string[] }> {
  return uniqueAsConflict(() =>
    db.transaction().execute(async (trx) => {
      const current = await getSetType(trx, user, input.setTypeId);
      await catalogueOrganisation(trx, user, current.organisationId);
      await assertUnique(trx, current.organisationId, input, current.id);
      await assertIfu(trx, current.organisationId, input.ifuFileId);
      const next = valuesFromFields(input);
      const changes = describeChanges(valuesOf(current), next);
      const ifuBefore = current.ifu?.id ?? null;
      if (ifuBefore !== input.ifuFileId) {
        changes.push(input.ifuFileId === null ? "instructions for use removed" : ifuBefore ? "instructions for use replaced" : "instructions for use added");
      }
      if (changes.length === 0) return { id: current.id, changes };
      await trx
        .updateTable("set_types")
        .set({ ...setTypeColumns(next), ifu_file_id: input.ifuFileId, updated_at: now.toISOString() })
        .where("id", "=", current.id)
        .execute();
      await writeItems(trx, current.id, input.items);
      await recordAudit(
        trx,
        {
          actorUserId: user.id,
          organisationId: current.organisationId,
          action: "set_type.updated",
          entity: "set_type",
          entityId: current.id,
          details: { code: next.code, changes },
        },
        now,
      );
      return { id: current.id, changes };
    }),
  );
}

/** Takes a set type out of the catalogue (its sets and history stay) or puts it back. */
export async function setSetTypeActive(
  db: Db,
  user: SessionUser,
  input: { setTypeId: number; active: boolean },
  now = new Date(),
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const current = await getSetType(trx, user, input.setTypeId);
    await catalogueOrganisation(trx, user, current.organisationId);
    if (current.active === input.active) {
      throw new AppError("conflict", input.active ? "This set type is already active." : "This set type is already inactive.");
    }
    await trx
      .updateTable("set_types")
      .set({ active: input.active ? 1 : 0, updated_at: now.toISOString() })
      .where("id", "=", current.id)
      .execute();
    await recordAudit(
      trx,
      {
        actorUserId: user.id,
        organisationId: current.organisationId,
        action: input.active ? "set_type.reactivated" : "set_type.deactivated",
        entity: "set_type",
        entityId: current.id,
        details: { code: current.code },
      },
      now,
    );
  });
}
