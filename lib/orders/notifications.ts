import "server-only";
import type { Kysely, Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { CUSTOMER_ROLES } from "@/lib/auth/roles";
import { expectedDeliveryAt } from "@/lib/dispatch/publish";
import { serverEnv } from "@/lib/env";
import { formatDateTime } from "@/lib/format";
import { enqueueMail } from "@/lib/mail/outbox";
import {
  bookingConfirmedMail,
  collectedMail,
  deliveredMail,
  type OrderMailContext,
  outForDeliveryMail,
  readyMail,
} from "@/lib/mail/order-templates";
import type { RenderedMail } from "@/lib/mail/templates";
import { type MailKind, parseMailPreferences } from "./mail-preferences";

// Who at the clinic hears about an order, and what they are told. Queued in the same transaction
// as the change, once per order, kind and person.

type Executor = Kysely<Database> | Transaction<Database>;

/** The order's organisation's active users at its site (or at every site), who chose this kind. */
export async function recipientsFor(db: Executor, order: { organisation_id: number; site_id: number }, kind: MailKind) {
  const users = await db
    .selectFrom("users")
    .select(["id", "name", "email", "mail_preferences"])
    .where("organisation_id", "=", order.organisation_id)
    .where("status", "=", "active")
    .where("role", "in", [...CUSTOMER_ROLES])
    .where((eb) => eb.or([eb("site_id", "is", null), eb("site_id", "=", order.site_id)]))
    .execute();
  return users.filter((u) => parseMailPreferences(u.mail_preferences)[kind]);
}

async function context(db: Executor, orderId: number) {
  const order = await db
    .selectFrom("orders")
    .innerJoin("sites", "sites.id", "orders.site_id")
    .select([
      "orders.id",
      "orders.reference",
      "orders.kind",
      "orders.organisation_id",
      "orders.site_id",
      "orders.collection_from",
      "orders.collection_until",
      "orders.promised_return_at",
      "orders.created_by",
      "sites.name as site_name",
    ])
    .where("orders.id", "=", orderId)
    .executeTakeFirstOrThrow();
  const column = order.kind === "pickup" ? "cycles.order_id" : "cycles.return_order_id";
  const sets = await db
    .selectFrom("cycles")
    .innerJoin("sets", "sets.id", "cycles.set_id")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.serial", "set_types.name"])
    .where(column, "=", orderId)
    .where("cycles.state", "!=", "cancelled")
    .orderBy("sets.serial")
    .execute();
  const extras = await db.selectFrom("order_extras").select(["description", "quantity"]).where("order_id", "=", orderId).execute();
  return { order, sets, extras };
}

/** Queues the notification of one kind about an order for everyone who chose it. */
export async function notifyOrder(
  db: Executor,
  orderId: number,
  kind: Exclude<MailKind, "problem_answered" | "expiry_digest">,
  now: Date,
  extra: { expectedAt?: Date | null } = {},
): Promise<number> {
  const { order, sets, extras } = await context(db, orderId);
  const env = serverEnv();
  const tz = env.UNIT_TIME_ZONE;
  let recipients = await recipientsFor(db, order, kind);
  // The expected time of a delivery comes from the day's published van plan when there is one.
  const expectedAt =
    extra.expectedAt !== undefined ? extra.expectedAt : kind === "out_for_delivery" && recipients.length > 0 ? await expectedDeliveryAt(db, orderId, tz) : null;
  // A booking confirmation goes to the person who booked (if they want it).
  if (kind === "booking_confirmed") recipients = recipients.filter((r) => r.id === order.created_by);
  for (const r of recipients) {
    const ctx: OrderMailContext = {
      recipientName: r.name,
      reference: order.reference,
      siteName: order.site_name,
      link: `${env.APP_URL}/clinic/orders/${order.id}`,
      sets,
      extras,
    };
    let mail: RenderedMail;
    switch (kind) {
      case "booking_confirmed":
        mail = bookingConfirmedMail(ctx, {
          collection: `${formatDateTime(order.collection_from, tz)} and ${formatDateTime(order.collection_until, tz).split(", ").pop()}`,
          promised: formatDateTime(order.promised_return_at, tz),
        });
        break;
      case "collected":
        mail = collectedMail(ctx);
        break;
      case "ready":
        mail = readyMail(ctx);
        break;
      case "out_for_delivery":
        mail = outForDeliveryMail(ctx, expectedAt ? formatDateTime(expectedAt, tz) : null);
        break;
      case "delivered":
        mail = deliveredMail(ctx);
        break;
    }
    await enqueueMail(
      db,
      { template: `order.${kind}`, to: r.email, organisationId: order.organisation_id, dedupeKey: `order:${order.id}:${kind}:${r.id}`, ...mail },
      now,
    );
  }
  return recipients.length;
}
