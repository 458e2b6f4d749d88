import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";

// The append-only audit log: who changed what. Written in the same transaction as the change.

export interface AuditEntry {
  actorUserId: number | null;
  organisationId?: number | null;
  action: string;
  entity: string;
  entityId?: string | number | null;
  details?: Record<string, unknown>;
}

export async function recordAudit(
  db: Kysely<Database> | Transaction<Database>,
  entry: AuditEntry,
  now = new Date(),
): Promise<void> {
  await db
    .insertInto("audit_log")
    .values({
      at: now.toISOString(),
      actor_user_id: entry.actorUserId,
      organisation_id: entry.organisationId ?? null,
      action: entry.action,
      entity: entry.entity,
      entity_id: entry.entityId == null ? null : String(entry.entityId),
      details: JSON.stringify(entry.details ?? {}),
    })
    .execute();
}
