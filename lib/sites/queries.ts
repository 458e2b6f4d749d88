import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { notFound } from "@/lib/errors";
import { fetchPage, type Page, searchTerm } from "@/lib/http/paging";
import { type OpeningHours, parseOpeningHours } from "./opening-hours";
import type { ListSitesQuery } from "./schemas";

// Sites as the caller may see them: scoped to their organisation (clinic staff: their site).

export interface SiteView {
  id: number;
  organisationId: number;
  organisationName: string;
  name: string;
  addressLine1: string;
  addressLine2: string | null;
  town: string;
  postcode: string;
  latitude: number;
  longitude: number;
  openingHours: OpeningHours;
  deliveryNotes: string | null;
  contactName: string | null;
  contactPhone: string | null;
  contactEmail: string | null;
  isDepot: boolean;
  active: boolean;
}

function baseQuery(db: Kysely<Database>, user: SessionUser) {
  return db
    .selectFrom("sites")
    .innerJoin("organisations", "organisations.id", "sites.organisation_id")
    .selectAll("sites")
    .select("organisations.name as organisation_name")
    .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }));
}

type SiteRow = Awaited<ReturnType<ReturnType<typeof baseQuery>["executeTakeFirstOrThrow"]>>;

function toView(row: SiteRow): SiteView {
  return {
    id: row.id,
    organisationId: row.organisation_id,
    organisationName: row.organisation_name,
    name: row.name,
    addressLine1: row.address_line1,
    addressLine2: row.address_line2,
    town: row.town,
    postcode: row.postcode,
    latitude: row.latitude,
    longitude: row.longitude,
    openingHours: parseOpeningHours(row.opening_hours),
    deliveryNotes: row.delivery_notes,
    contactName: row.contact_name,
    contactPhone: row.contact_phone,
    contactEmail: row.contact_email,
    isDepot: row.is_depot === 1,
    active: row.active === 1,
  };
}

export async function listSites(
  db: Kysely<Database>,
  user: SessionUser,
  filter: { organisationId?: number } = {},
): Promise<SiteView[]> {
  let query = baseQuery(db, user);
  if (filter.organisationId) query = query.where("sites.organisation_id", "=", filter.organisationId);
  const rows = await query.orderBy("organisations.name").orderBy("sites.name").execute();
  return rows.map(toView);
}

const SORTS = {
  name: "sites.name",
  organisation: "organisations.name",
  town: "sites.town",
  postcode: "sites.postcode",
} as const;

/** One page of sites for the sites table, filtered and sorted on the server. */
export async function listSitesPage(db: Kysely<Database>, user: SessionUser, query: ListSitesQuery): Promise<Page<SiteView>> {
  let base = db
    .selectFrom("sites")
    .innerJoin("organisations", "organisations.id", "sites.organisation_id")
    .where(tenantScope(user, { organisation: "sites.organisation_id", site: "sites.id" }));
  if (query.q) base = base.where(searchTerm(["sites.name", "sites.town", "sites.postcode", "organisations.name"], query.q));
  if (query.organisationId) base = base.where("sites.organisation_id", "=", query.organisationId);
  if (query.active) base = base.where("sites.active", "=", query.active === "yes" ? 1 : 0);
  const page = await fetchPage(
    base,
    (qb) => qb.selectAll("sites").select("organisations.name as organisation_name"),
    query,
    SORTS[query.sort],
    "sites.id",
  );
  return { total: page.total, rows: page.rows.map(toView) };
}

/** One site, or a 404 when it does not exist or belongs to another tenant. */
export async function getSite(db: Kysely<Database>, user: SessionUser, id: number): Promise<SiteView> {
  const row = await baseQuery(db, user).where("sites.id", "=", id).executeTakeFirst();
  if (!row) throw notFound("That site");
  return toView(row);
}
