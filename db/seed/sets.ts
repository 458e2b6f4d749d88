import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { mulberry32, randomInt } from "@/lib/routing/random";
import { formatSetSerial, setGiai } from "@/lib/sets/identifiers";
import type { SeedResult } from "./demo";

// The demo's physical sets: a few barcoded instances of every set type in each customer's
// catalogue, spread over the customer's sites, numbered per customer, a few of them retired.
// Deterministic: every choice comes from a generator seeded by the set type's code.

/** How many instances of a set type a customer owns, by its class: a range, inclusive. */
export const INSTANCES_BY_CLASS: Record<string, readonly [number, number]> = {
  single_instrument: [5, 8],
  dental_cassette: [6, 8],
  basic_tray: [4, 6],
  major_tray: [3, 5],
  rigid_container: [3, 4],
  specialist_tray: [2, 3],
  loaner_set: [2, 2],
};
const DEFAULT_INSTANCES: readonly [number, number] = [2, 4];

const RETIREMENT_REASONS = [
  "Container lid hinge cracked; withdrawn and replaced.",
  "Tray basket bent in transit; not repairable.",
  "Instruments worn beyond repair; set taken out of use by the customer.",
  "Set consolidated into another tray on the customer's request.",
] as const;

const DAY_MS = 24 * 60 * 60 * 1000;

export interface PlannedSetTypeInput {
  id: number;
  organisationId: number;
  code: string;
  setClass: string;
}

/** A site that may be a set's home; `accepts` limits it to set types whose code starts so. */
export interface PlannedSiteInput {
  id: number;
  /** Code prefixes of the set types kept at this site; absent: any set type. */
  accepts?: readonly string[];
  /** Set types this site accepts are kept here only, not at the organisation's other sites. */
  exclusive?: boolean;
}

/**
 * Where the demo's set types live, by site name: the eye centre keeps the ophthalmic sets (and
 * only those), the small treatment rooms keep minor sets besides the main centre's.
 */
export const DEMO_SITE_FIT: Record<string, Omit<PlannedSiteInput, "id">> = {
  "Quillby Moor Eye Centre": { accepts: ["OPH-"], exclusive: true },
  "Hesketh Fold Treatment Rooms": { accepts: ["DS-MIN-", "DS-SKN-", "DS-TOE-", "DS-SUT-", "DS-VAS-"] },
};

const accepts = (site: PlannedSiteInput, code: string) => !site.accepts || site.accepts.some((prefix) => code.startsWith(prefix));

// The sites a set type's instances are spread over.
function homesFor(code: string, sites: readonly PlannedSiteInput[]): number[] {
  const exclusive = sites.filter((s) => s.exclusive && accepts(s, code));
  const candidates = exclusive.length > 0 ? exclusive : sites.filter((s) => !s.exclusive && accepts(s, code));
  return (candidates.length > 0 ? candidates : sites).map((s) => s.id);
}

export interface PlannedSet {
  organisationId: number;
  setTypeId: number;
  homeSiteId: number;
  /** 1, 2, 3… within the organisation, in the order of the plan. */
  sequence: number;
  createdAt: string;
  /** Set for the sets the plan retires: when and why. */
  retired?: { at: string; reason: string };
}

// FNV-1a over the text: a stable 32-bit seed per set type, so adding a set type to the
// catalogue does not change any other type's sets.
function seedOf(text: string): number {
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193) >>> 0;
  }
  return hash;
}

/**
 * The demo's sets for the given set types (sorted by organisation and code) and each
 * organisation's sites, a type's instances taking the sites that fit it in turn. Pure: the same
 * input always gives the same plan.
 */
export function planDemoSets(
  setTypes: readonly PlannedSetTypeInput[],
  sitesByOrganisation: ReadonlyMap<number, readonly PlannedSiteInput[]>,
  now: Date,
): PlannedSet[] {
  const ordered = [...setTypes].sort((a, b) => a.organisationId - b.organisationId || (a.code < b.code ? -1 : a.code > b.code ? 1 : 0));
  const nextSequence = new Map<number, number>();
  const plan: PlannedSet[] = [];
  for (const type of ordered) {
    const organisationSites = sitesByOrganisation.get(type.organisationId) ?? [];
    if (organisationSites.length === 0) continue;
    const sites = homesFor(type.code, organisationSites);
    const rand = mulberry32(seedOf(`${type.organisationId}:${type.code}`));
    const [min, max] = INSTANCES_BY_CLASS[type.setClass] ?? DEFAULT_INSTANCES;
    const count = min + randomInt(rand, max - min + 1);
    // Bought together, between 100 and 400 days ago (before the demo's 90 days of history),
    // entered in the morning.
    const today = Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate());
    const bought = today - (100 + randomInt(rand, 300)) * DAY_MS + (9 * 60 + 30) * 60_000;
    const firstSite = randomInt(rand, sites.length);
    for (let i = 0; i < count; i++) {
      const sequence = (nextSequence.get(type.organisationId) ?? 0) + 1;
      nextSequence.set(type.organisationId, sequence);
      const createdAt = new Date(bought + i * 60_000);
      const planned: PlannedSet = {
        organisationId: type.organisationId,
        setTypeId: type.id,
        homeSiteId: sites[(firstSite + i) % sites.length],
        sequence,
        createdAt: createdAt.toISOString(),
      };
      // About one set in 25 has been retired, some weeks after it was bought; never the only one.
      if (count > 2 && rand() < 0.04) {
        const at = new Date(createdAt.getTime() + (20 + randomInt(rand, 60)) * DAY_MS);
        planned.retired = { at: at.toISOString(), reason: RETIREMENT_REASONS[randomInt(rand, RETIREMENT_REASONS.length)] };
      }
      plan.push(planned);
    }
  }
  return plan;
}

/**
 * Writes the demo's sets for the set types already in the transaction (the catalogue's part of
 * the scenario runs first). Returns the set ids by serial.
 */
export async function seedSets(trx: Transaction<Database>, result: SeedResult, now: Date): Promise<Record<string, number>> {
  const customers = await trx
    .selectFrom("organisations")
    .select(["id", "short_code"])
    .where("kind", "=", "customer")
    .where("active", "=", 1)
    .execute();
  const shortCodes = new Map(customers.map((c) => [c.id, c.short_code]));
  const customerIds = customers.map((c) => c.id);
  if (customerIds.length === 0) return {};
  const setTypes = await trx
    .selectFrom("set_types")
    .select(["id", "organisation_id", "code", "set_class"])
    .where("organisation_id", "in", customerIds)
    .where("active", "=", 1)
    .execute();
  const sites = await trx
    .selectFrom("sites")
    .select(["id", "organisation_id", "name"])
    .where("organisation_id", "in", customerIds)
    .where("is_depot", "=", 0)
    .where("active", "=", 1)
    .orderBy("id")
    .execute();
  const sitesByOrganisation = new Map<number, PlannedSiteInput[]>();
  for (const site of sites) {
    const list = sitesByOrganisation.get(site.organisation_id) ?? [];
    list.push({ id: site.id, ...DEMO_SITE_FIT[site.name] });
    sitesByOrganisation.set(site.organisation_id, list);
  }

  const plan = planDemoSets(
    setTypes.map((t) => ({ id: t.id, organisationId: t.organisation_id, code: t.code, setClass: t.set_class })),
    sitesByOrganisation,
    now,
  );
  const admin = result.users["admin@larkmoor.example"] ?? null;
  const ids: Record<string, number> = {};
  for (const planned of plan) {
    const serial = formatSetSerial(shortCodes.get(planned.organisationId)!, planned.sequence);
    const { id } = await trx
      .insertInto("sets")
      .values({
        organisation_id: planned.organisationId,
        set_type_id: planned.setTypeId,
        home_site_id: planned.homeSiteId,
        serial,
        giai: setGiai(serial),
        status: planned.retired ? "retired" : "in_service",
        notes: null,
        created_at: planned.createdAt,
        updated_at: planned.retired?.at ?? planned.createdAt,
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    ids[serial] = id;
    if (planned.retired) {
      await trx
        .insertInto("audit_log")
        .values({
          at: planned.retired.at,
          actor_user_id: admin,
          organisation_id: planned.organisationId,
          action: "set.retired",
          entity: "set",
          entity_id: String(id),
          details: JSON.stringify({ reason: planned.retired.reason, from: "in_service", to: "retired" }),
        })
        .execute();
    }
  }
  return ids;
}
