import type { FakeState, InvoiceItemObject, InvoiceLineObject, InvoiceRow } from "../state";

// An invoice's lines and totals, derived from its invoice items. The fake has no taxes,
// discounts or shipping, so subtotal = total = the sum of the line amounts.

// The line an invoice item makes on its invoice; the line id follows the item id.
export function lineOf(item: InvoiceItemObject, invoiceId: string): InvoiceLineObject {
  return {
    id: `il_${item.id.slice(3)}`,
    object: "line_item",
    amount: item.amount,
    currency: item.currency,
    description: item.description,
    discount_amounts: [],
    discountable: item.discountable,
    discounts: [],
    invoice: invoiceId,
    livemode: false,
    metadata: { ...(item.metadata ?? {}) },
    parent: {
      type: "invoice_item_details",
      invoice_item_details: { invoice_item: item.id, proration: false, proration_details: { credited_items: null }, subscription: null },
      subscription_item_details: null,
    },
    period: { ...item.period },
    pretax_credit_amounts: [],
    pricing: item.pricing ? structuredClone(item.pricing) : null,
    quantity: item.quantity,
    quantity_decimal: item.quantity_decimal,
    subscription: null,
    subtotal: item.amount,
    taxes: [],
  };
}

export function invoiceLines(state: FakeState, row: InvoiceRow): InvoiceLineObject[] {
  const lines: InvoiceLineObject[] = [];
  for (const id of row.itemIds) {
    const item = state.invoiceItems.get(id);
    if (item) lines.push(lineOf(item.obj, row.obj.id));
  }
  return lines;
}

/**
 * Recomputes the amounts after a change of lines, payments or credit notes:
 * amount_due = max(0, total + applied customer balance − pre-payment credit notes),
 * amount_remaining = max(0, amount_due − amount_paid). The customer balance is applied at
 * finalization (starting_balance → ending_balance), as Stripe documents for invoices.
 */
export function recomputeTotals(state: FakeState, row: InvoiceRow): void {
  const o = row.obj;
  const subtotal = invoiceLines(state, row).reduce((sum, l) => sum + l.amount, 0);
  o.subtotal = subtotal;
  o.subtotal_excluding_tax = subtotal;
  o.total = subtotal;
  o.total_excluding_tax = subtotal;
  const beforeCredits = o.ending_balance === null ? Math.max(0, o.total) : Math.max(0, o.total + o.starting_balance);
  o.amount_due = Math.max(0, beforeCredits - o.pre_payment_credit_notes_amount);
  o.amount_remaining = Math.max(0, o.amount_due - o.amount_paid);
}
