import { z } from "zod";

// The notification e-mails a clinic user can choose to receive.

export const MAIL_KINDS = [
  "booking_confirmed",
  "collected",
  "ready",
  "out_for_delivery",
  "delivered",
  "problem_answered",
  "expiry_digest",
] as const;
export type MailKind = (typeof MAIL_KINDS)[number];

export const MAIL_KIND_LABELS: Record<MailKind, string> = {
  booking_confirmed: "A pickup I booked is confirmed",
  collected: "Our sets have been collected",
  ready: "Our sets are processed and ready to return",
  out_for_delivery: "Our sets are on the van, with the expected time",
  delivered: "Our sets have been delivered",
  problem_answered: "The unit has answered a problem we reported",
  expiry_digest: "Weekly list of our sets nearing their expiry date",
};

export type MailPreferences = Record<MailKind, boolean>;

export const mailPreferencesSchema = z.object(
  Object.fromEntries(MAIL_KINDS.map((k) => [k, z.boolean()])) as Record<MailKind, z.ZodBoolean>,
);

/** A user's stored preferences; every kind not chosen yet is on. */
export function parseMailPreferences(json: string | null | undefined): MailPreferences {
  let stored: Record<string, unknown> = {};
  try {
    stored = json ? (JSON.parse(json) as Record<string, unknown>) : {};
  } catch {
    stored = {};
  }
  return Object.fromEntries(MAIL_KINDS.map((k) => [k, stored[k] !== false])) as MailPreferences;
}
