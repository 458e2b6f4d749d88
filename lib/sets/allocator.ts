import "server-only";
import { sql, type Transaction } from "kysely";
import { uniqueViolation } from "@/db/dialect";
import type { Database } from "@/db/schema";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { Gs1Error } from "@/lib/labels/gs1";
import { formatSetSerial, parseSetSerial, setGiai, shortCodeProblem } from "./identifiers";

// Picks the next serials and GIAIs of a customer's sets, inside the transaction that inserts them.

export interface SetIdentifier {
  serial: string;
  giai: string;
}

/**
 * Takes the database's write lock for this transaction before anything is read. SQLite allows
 * one writer at a time; a transaction that reads first and writes later can be overtaken by
 * another writer between the two (then its numbers would collide). Writing first makes the
 * read that follows see every committed set, and holds other writers off until we commit. On
 * PostgreSQL the same update locks the organisation's row, so two batches for one customer
 * queue behind each other the same way.
 */
async function takeWriteLock(trx: Transaction<Database>, organisationId: number): Promise<void> {
  await sql`update organisations set updated_at = updated_at where id = ${organisationId}`.execute(trx);
}

/** The highest set number used so far in the organisation (0 when it has no sets yet). */
export async function highestSetNumber(trx: Transaction<Database>, organisationId: number): Promise<number> {
  const rows = await trx.selectFrom("sets").select("serial").where("organisation_id", "=", organisationId).execute();
  let highest = 0;
  for (const row of rows) {
    const parsed = parseSetSerial(row.serial);
    if (parsed && parsed.sequence > highest) highest = parsed.sequence;
  }
  return highest;
}

/**
 * The next `count` serials and GIAIs of an organisation's sets. Numbers continue from the
 * highest one the organisation has used, whatever short code it had then, so a serial is never
 * given out twice. Call it inside the transaction that inserts the sets; the unique constraints
 * on sets.giai and (organisation_id, serial) stay the backstop.
 */
export async function allocateSetIdentifiers(
  trx: Transaction<Database>,
  organisation: { id: number; shortCode: string },
  count: number,
  companyPrefix: string = serverEnv().GS1_COMPANY_PREFIX,
): Promise<SetIdentifier[]> {
  const problem = shortCodeProblem(organisation.shortCode);
  if (problem) throw new AppError("validation", `${problem} Change the customer's short code first.`);
  await takeWriteLock(trx, organisation.id);
  const first = (await highestSetNumber(trx, organisation.id)) + 1;
  const identifiers: SetIdentifier[] = [];
  for (let sequence = first; sequence < first + count; sequence++) {
    const serial = formatSetSerial(organisation.shortCode, sequence);
    try {
      identifiers.push({ serial, giai: setGiai(serial, companyPrefix) });
    } catch (error) {
      if (error instanceof Gs1Error) {
        throw new AppError("validation", `Set ${serial} cannot get a GS1 identifier: ${error.message}.`);
      }
      throw error;
    }
  }
  return identifiers;
}

/** True for a unique-constraint failure on the sets' serial or GIAI (SQLite or PostgreSQL). */
export function isSetIdentifierCollision(error: unknown): boolean {
  const violation = uniqueViolation(error);
  return violation?.table === "sets" && violation.columns.some((c) => c === "giai" || c === "serial" || c === "organisation_id");
}
