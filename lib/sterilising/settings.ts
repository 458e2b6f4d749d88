import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { DEFAULT_HEAVY_SET_THRESHOLD_G } from "./placement";
import { DEFAULT_SHELF_LIFE_RULES, type ShelfLifeRule, STORAGE_KINDS } from "./shelf-life";

// The sterilising area's settings the quality lead may change: the vacuum leak-rate limit, the
// weight above which a set goes on the lower shelf, and the shelf-life rules. Unset values fall
// back to the defaults (the rules to DIN 58953-8 guide values).

type Db = Kysely<Database> | Transaction<Database>;

/** Vacuum leak test limit: 1.3 mbar/min = 0.13 kPa/min (EN 285 / HTM 2010, via secondary sources; CHECKS.md). */
export const DEFAULT_LEAK_LIMIT_KPA_MIN = 0.13;

export interface SterileSettings {
  leakLimitKpaMin: number;
  heavySetThresholdG: number;
}

export async function getSterileSettings(db: Db): Promise<SterileSettings> {
  const rows = await db.selectFrom("sterile_settings").select(["key", "value"]).execute();
  const value = (key: string, fallback: number) => {
    const n = Number(rows.find((r) => r.key === key)?.value);
    return Number.isFinite(n) && n > 0 ? n : fallback;
  };
  return {
    leakLimitKpaMin: value("leak_limit_kpa_min", DEFAULT_LEAK_LIMIT_KPA_MIN),
    heavySetThresholdG: value("heavy_set_threshold_g", DEFAULT_HEAVY_SET_THRESHOLD_G),
  };
}

/** The rules in force: stored ones, and the defaults for any packaging/storage not stored. */
export async function getShelfLifeRules(db: Db): Promise<ShelfLifeRule[]> {
  const stored = await db.selectFrom("shelf_life_rules").select(["packaging", "storage", "amount", "unit"]).execute();
  const rules: ShelfLifeRule[] = stored.map((r) => ({ packaging: r.packaging, storage: r.storage, amount: r.amount, unit: r.unit }));
  for (const d of DEFAULT_SHELF_LIFE_RULES) {
    if (!rules.some((r) => r.packaging === d.packaging && r.storage === d.storage)) rules.push({ ...d });
  }
  return rules;
}

export async function updateSterileSettings(
  db: Kysely<Database>,
  user: SessionUser,
  input: { leakLimitKpaMin: number; heavySetThresholdG: number; rules: ShelfLifeRule[] },
  now = new Date(),
): Promise<void> {
  for (const r of input.rules) {
    if (!STORAGE_KINDS.includes(r.storage)) throw new AppError("validation", `Unknown storage ${r.storage}.`);
  }
  const iso = now.toISOString();
  await db.transaction().execute(async (trx) => {
    for (const [key, value] of [
      ["leak_limit_kpa_min", input.leakLimitKpaMin],
      ["heavy_set_threshold_g", input.heavySetThresholdG],
    ] as const) {
      await trx
        .insertInto("sterile_settings")
        .values({ key, value: String(value), updated_by: user.id, updated_at: iso })
        .onConflict((oc) => oc.column("key").doUpdateSet({ value: String(value), updated_by: user.id, updated_at: iso }))
        .execute();
    }
    for (const r of input.rules) {
      await trx
        .insertInto("shelf_life_rules")
        .values({ packaging: r.packaging, storage: r.storage, amount: r.amount, unit: r.unit, updated_by: user.id, updated_at: iso })
        .onConflict((oc) => oc.columns(["packaging", "storage"]).doUpdateSet({ amount: r.amount, unit: r.unit, updated_by: user.id, updated_at: iso }))
        .execute();
    }
    await recordAudit(trx, { actorUserId: user.id, action: "sterile_settings.updated", entity: "sterile_settings", details: { ...input } }, now);
  });
}
