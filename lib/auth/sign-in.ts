import { addMinutes, subMinutes } from "date-fns";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { AppError } from "@/lib/errors";
import { verifyPassword } from "./password";

// Credential checks with throttling: after 5 failures for an account within 15 minutes, further
// attempts are refused until the oldest of those failures is 15 minutes old.

export const MAX_FAILURES = 5;
export const FAILURE_WINDOW_MINUTES = 15;

// A fixed Argon2id hash so an unknown e-mail costs as much time as a wrong password.
const DUMMY_HASH = "$argon2id$v=19$m=19456,t=2,p=1$3Vlvvozn7L+Y9sxU0gzgqw$7776t262O+QKqtE5CnTMSy0zTeL4QUWgT3Uk9KOvc1A";

export function normaliseEmail(email: string): string {
  return email.trim().toLowerCase();
}

/** When the account may try again, or null when it is not throttled. */
export async function throttledUntil(db: Kysely<Database>, email: string, now: Date): Promise<Date | null> {
  const since = subMinutes(now, FAILURE_WINDOW_MINUTES).toISOString();
  const recent = await db
    .selectFrom("sign_in_failures")
    .select("at")
    .where("email", "=", normaliseEmail(email))
    .where("at", ">", since)
    .orderBy("at", "desc")
    .limit(MAX_FAILURES)
    .execute();
  if (recent.length < MAX_FAILURES) return null;
  const oldestCounted = recent[recent.length - 1]!.at;
  return addMinutes(new Date(oldestCounted), FAILURE_WINDOW_MINUTES);
}

export interface VerifiedAccount {
  userId: number;
  sessionVersion: number;
}

/**
 * Checks an e-mail and password. Throws AppError "throttled" (with the retry time in the message)
 * or "unauthenticated"; records the failure; clears the failures on success.
 */
export async function verifyCredentials(
  db: Kysely<Database>,
  input: { email: string; password: string },
  now = new Date(),
): Promise<VerifiedAccount> {
  const email = normaliseEmail(input.email);
  const until = await throttledUntil(db, email, now);
  if (until) {
    const time = until.toISOString().slice(11, 16);
    throw new AppError(
      "throttled",
      `Too many failed sign-ins for this account. Try again after ${time} UTC (${until.toISOString()}).`,
    );
  }
  const user = await db
    .selectFrom("users")
    .select(["id", "password_hash", "status", "session_version"])
    .where("email", "=", email)
    .executeTakeFirst();
  const ok = await verifyPassword(user?.password_hash ?? DUMMY_HASH, input.password);
  if (!user || !ok || !user.password_hash) {
    await db.insertInto("sign_in_failures").values({ email, at: now.toISOString() }).execute();
    throw new AppError("unauthenticated", "Wrong e-mail or password.");
  }
  if (user.status !== "active") {
    throw new AppError("unauthenticated", "This account is not active. Ask your manager or the unit's administrator.");
  }
  await db.transaction().execute(async (trx) => {
    await trx.deleteFrom("sign_in_failures").where("email", "=", email).execute();
    await trx.updateTable("users").set({ last_sign_in_at: now.toISOString() }).where("id", "=", user.id).execute();
  });
  return { userId: user.id, sessionVersion: user.session_version };
}
