import type Stripe from "stripe";
import type { Ctx } from "../context";
import { badState, invalidParam, invalidRequest } from "../errors";
import { paginate, readListQuery } from "../list";
import { inRange, missing, type Params } from "../params";
import { newestFirst, newId, type ChargeObject, type RefundObject, type Row } from "../state";
import { copy, newMetadata, rowOf } from "./common";
import { renderCharge } from "./payments";

// POST/GET /v1/refunds, GET /v1/refunds/:id. Refunds succeed at once. Like Stripe, a refund
// made here leaves its invoice paid; a credit note with refund_amount records the credit too.

export function renderRefund(row: Row<RefundObject>): RefundObject {
  return copy(row.obj);
}

// What is left to refund on a successful charge.
export function refundable(charge: ChargeObject): number {
  return charge.status === "succeeded" ? charge.amount - charge.amount_refunded : 0;
}

/** Refunds `amount` of a charge (the caller has checked it against `refundable`). */
export function refundCharge(
  ctx: Ctx,
  charge: Row<ChargeObject>,
  amount: number,
  reason: Stripe.Refund.Reason | null,
  metadata: Stripe.Metadata,
): Row<RefundObject> {
  const c = charge.obj;
  const obj: RefundObject = {
    id: newId("re"),
    object: "refund",
    amount,
    balance_transaction: null,
    charge: c.id,
    created: ctx.now,
    currency: c.currency,
    customer: c.customer,
    customer_account: null,
    metadata,
    payment_intent: c.payment_intent,
    payment_method: c.payment_method,
    reason,
    receipt_number: null,
    source_transfer_reversal: null,
    status: "succeeded",
    transfer_reversal: null,
  };
  const row = ctx.state.add(ctx.state.refunds, { obj });
  c.amount_refunded += amount;
  c.refunded = c.amount_refunded === c.amount;
  ctx.emit("refund.created", renderRefund(row));
  ctx.emit("charge.refunded", renderCharge(charge));
  return row;
}

// The charge to refund: given directly, or the successful charge of a payment intent.
function chargeToRefund(ctx: Ctx, chargeId: string | undefined, intentId: string | undefined): Row<ChargeObject> {
  if (chargeId && intentId) {
    throw invalidParam("You may only specify one of these parameters: charge, payment_intent.", "payment_intent", "parameters_exclusive");
  }
  if (chargeId) return rowOf(ctx.state.charges, chargeId, "charge", "charge");
  if (!intentId) throw missing("charge");
  const intent = rowOf(ctx.state.paymentIntents, intentId, "payment_intent", "payment_intent");
  const latest = intent.obj.latest_charge;
  const charge = typeof latest === "string" ? ctx.state.charges.get(latest) : undefined;
  if (intent.obj.status !== "succeeded" || !charge) {
    throw badState(`PaymentIntent ${intentId} has no successful charge to refund.`, "charge_not_refundable");
  }
  return charge;
}

// POST /v1/refunds
export function createRefund(ctx: Ctx, p: Params): object {
  const chargeId = p.id("charge", ["ch_"]);
  const intentId = p.id("payment_intent", ["pi_"]);
  const amount = p.integer("amount", { min: 1 });
  const reason = p.enumOf("reason", ["duplicate", "fraudulent", "requested_by_customer"] as const) ?? null;
  const metadata = newMetadata(p.metadata());
  p.done();
  const charge = chargeToRefund(ctx, chargeId, intentId);
  const left = refundable(charge.obj);
  if (charge.obj.status !== "succeeded") throw badState(`Charge ${charge.obj.id} did not succeed; there is nothing to refund.`, "charge_not_refundable");
  if (left === 0) throw badState(`Charge ${charge.obj.id} has already been refunded.`, "charge_already_refunded");
  const value = amount ?? left;
  if (value > left) {
    throw invalidRequest(`Refund amount (${value}) is greater than unrefunded amount on charge (${left}).`, {
      param: "amount",
      code: "amount_too_large",
    });
  }
  return renderRefund(refundCharge(ctx, charge, value, reason, metadata));
}

// GET /v1/refunds/:id
export function retrieveRefund(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return renderRefund(rowOf(ctx.state.refunds, path.id, "refund"));
}

// GET /v1/refunds (charge, payment_intent, created)
export function listRefunds(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const charge = p.string("charge");
  const intent = p.string("payment_intent");
  const created = p.range("created");
  p.done();
  const rows = newestFirst(ctx.state.refunds.values()).filter(
    (r) =>
      (charge === undefined || r.obj.charge === charge) &&
      (intent === undefined || r.obj.payment_intent === intent) &&
      inRange(r.obj.created, created),
  );
  return paginate(rows.map(renderRefund), q, "/v1/refunds");
}
