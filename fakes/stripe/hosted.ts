import type { IncomingMessage, ServerResponse } from "node:http";
import type { CardInput } from "./cards";
import type { Ctx } from "./context";
import type { FakeCore } from "./core";
import type { FakeStripeError } from "./errors";
import { esc, parseForm, sendBytes, sendText } from "./http-util";
import { formatAmount } from "./money";
import { renderPdf } from "./pdf";
import { completeCheckoutSession, successLink } from "./resources/checkout";
import { invoiceLines } from "./resources/invoice-math";
import { payInvoiceWithCard } from "./resources/invoices";
import type { CheckoutSessionRow, InvoiceRow } from "./state";

// The fake's own pages behind `hosted_invoice_url`, a Checkout session's `url`, and the PDF
// links: plain HTML titled "Test payment page" that shows what is due and takes one of the
// published test card numbers.

/** The outcome of paying on a page or through /_fake/…/pay. */
export type PayResult =
  | { outcome: "paid" }
  | { outcome: "declined"; code: string; declineCode: string | null; message: string }
  | { outcome: "card_error"; code: string; message: string }
  | { outcome: "not_payable"; message: string };

export function resultOf(ok: boolean, error: FakeStripeError | undefined): PayResult {
  if (ok) return { outcome: "paid" };
  const body = error!.body;
  if (body.type === "card_error" && body.charge) {
    return { outcome: "declined", code: body.code ?? "card_declined", declineCode: body.decline_code ?? null, message: body.message };
  }
  if (body.type === "card_error") return { outcome: "card_error", code: body.code ?? "card_error", message: body.message };
  return { outcome: "not_payable", message: body.message };
}

export function statusOf(result: PayResult): number {
  switch (result.outcome) {
    case "paid":
      return 200;
    case "declined":
      return 402;
    case "card_error":
      return 400;
    case "not_payable":
      return 409;
  }
}

/** One card attempt on an invoice, as the hosted page makes it. */
export function payInvoiceByCard(core: FakeCore, row: InvoiceRow, card: CardInput): PayResult {
  const ctx = core.ctx({ id: null, idempotency_key: null });
  const attempt = payInvoiceWithCard(ctx, row, { card });
  core.commit(ctx);
  return resultOf(attempt.ok, attempt.ok ? undefined : attempt.error);
}

/** One card attempt on a Checkout session, as the hosted page makes it. */
export function payCheckoutByCard(core: FakeCore, row: CheckoutSessionRow, card: CardInput): PayResult {
  const ctx = core.ctx({ id: null, idempotency_key: null });
  const attempt = completeCheckoutSession(ctx, row, { card });
  core.commit(ctx);
  return resultOf(attempt.ok, attempt.ok ? undefined : attempt.error);
}

/**
 * Reads a card from a page form or a /_fake/ body: `number` (or `card_number`), `exp` ("MM/YY")
 * or `exp_month` + `exp_year`, `cvc`. With `fillDefaults` (the /_fake/ routes) a missing expiry
 * and code are filled in: any future date and any code do for test cards.
 */
export function cardFromFields(fields: Record<string, unknown>, now: Date, fillDefaults: boolean): CardInput {
  const str = (k: string) => {
    const v = fields[k];
    return typeof v === "string" ? v.trim() : typeof v === "number" ? String(v) : "";
  };
  const number = str("card_number") || str("number") || str("card");
  const exp = str("exp");
  const m = /^(\d{1,2})\s*\/\s*(\d{2}|\d{4})$/.exec(exp);
  let expMonth = m ? Number(m[1]) : Number(str("exp_month"));
  let expYear = m ? Number(m[2]) : Number(str("exp_year"));
  if (fillDefaults && exp === "" && str("exp_month") === "" && str("exp_year") === "") {
    expMonth = 12;
    expYear = now.getUTCFullYear() + 2;
  }
  const digits = number.replace(/\D/g, "");
  const cvc = str("cvc") || (fillDefaults ? (digits.length === 15 ? "1234" : "123") : "");
  return { number, expMonth, expYear, cvc };
}

export async function handleHosted(core: FakeCore, req: IncomingMessage, res: ServerResponse, pathname: string, body: string): Promise<void> {
  const parts = pathname.split("/").filter(Boolean); // ["hosted", kind, id, extra?]
  const [, kind, id, extra] = parts;
  const ctx = core.ctx({ id: null, idempotency_key: null });
  const now = new Date(ctx.now * 1000);
  if (kind === "invoices" && id) {
    const row = core.state.invoices.get(id);
    if (!row || row.obj.status === "draft") return notFound(res, "No finalized invoice has this address.");
    if (extra === "pdf" && req.method === "GET") return sendBytes(res, 200, await invoicePdf(ctx, row), "application/pdf");
    if (extra) return notFound(res, "Nothing here.");
    if (req.method === "POST") {
      const result = payInvoiceByCard(core, row, cardFromFields(parseForm(body), now, false));
      return sendText(res, statusOf(result), invoicePage(core.ctx({ id: null, idempotency_key: null }), row, result), "text/html");
    }
    return sendText(res, 200, invoicePage(ctx, row), "text/html");
  }
  if (kind === "checkout" && id && !extra) {
    const row = core.state.checkoutSessions.get(id);
    if (!row) return notFound(res, "No checkout session has this address.");
    if (req.method === "POST") {
      const result = payCheckoutByCard(core, row, cardFromFields(parseForm(body), now, false));
      return sendText(res, statusOf(result), checkoutPage(ctx, row, result), "text/html");
    }
    return sendText(res, 200, checkoutPage(ctx, row), "text/html");
  }
  if (kind === "credit_notes" && id && extra === "pdf") {
    const row = core.state.creditNotes.get(id);
    if (!row) return notFound(res, "No credit note has this address.");
    const invoice = core.state.invoices.get(row.obj.invoice as string);
    return sendBytes(
      res,
      200,
      await renderPdf({
        title: "Credit note",
        number: row.obj.number,
        issuer: ctx.config.accountName,
        customer: invoice?.obj.customer_name ?? invoice?.obj.customer_email ?? null,
        dates: [
          ["Issued", day(row.obj.effective_at ?? row.obj.created)],
          ["Against invoice", invoice?.obj.number ?? String(row.obj.invoice)],
        ],
        currency: row.obj.currency,
        lines: row.lines.map((l) => ({ description: l.description ?? "", quantity: l.quantity, amount: l.amount })),
        totals: [["Total credited", row.obj.total]],
        status: row.obj.status,
      }),
      "application/pdf",
    );
  }
  return notFound(res, "Nothing here.");
}

function invoicePdf(ctx: Ctx, row: InvoiceRow): Promise<Buffer> {
  const o = row.obj;
  const totals: [string, number][] = [["Total", o.total]];
  if (o.pre_payment_credit_notes_amount > 0) totals.push(["Credited", -o.pre_payment_credit_notes_amount]);
  if (o.amount_paid > 0) totals.push(["Paid", -o.amount_paid]);
  totals.push(["Amount due", o.amount_remaining]);
  return renderPdf({
    title: "Invoice",
    number: o.number,
    issuer: ctx.config.accountName,
    customer: [o.customer_name, o.customer_email].filter(Boolean).join(", ") || null,
    dates: [
      ["Issued", day(o.status_transitions.finalized_at ?? o.created)],
      ...(o.due_date ? ([["Due", day(o.due_date)]] as [string, string][]) : []),
    ],
    currency: o.currency,
    lines: invoiceLines(ctx.state, row).map((l) => ({ description: l.description ?? "", quantity: l.quantity, amount: l.amount })),
    totals,
    status: o.status ?? "",
  });
}

function day(unix: number): string {
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "long", year: "numeric", timeZone: "UTC" }).format(new Date(unix * 1000));
}

function notFound(res: ServerResponse, message: string): void {
  sendText(res, 404, page("Not found", `<h1>Not found</h1><p>${esc(message)}</p>`), "text/html");
}

const STYLE = `
  body { font-family: system-ui, sans-serif; background: #f3f4f1; color: #1d2421; margin: 0; }
  main { max-width: 34rem; margin: 2rem auto; background: #fff; border: 1px solid #cfd5cf; padding: 1.5rem 2rem; }
  .test { background: #fff4d6; border: 1px dashed #b58a00; padding: .5rem .75rem; font-size: .85rem; }
  h1 { font-size: 1.4rem; margin: 1rem 0 .25rem; }
  .payee { color: #55605a; margin: 0 0 1rem; }
  table { width: 100%; border-collapse: collapse; margin: 1rem 0; }
  td, th { padding: .35rem 0; border-bottom: 1px solid #e3e7e3; text-align: left; }
  td.num, th.num { text-align: right; }
  tr.due td { font-weight: 700; border-bottom: none; }
  label { display: block; margin-top: .75rem; font-size: .9rem; }
  input { width: 100%; box-sizing: border-box; padding: .5rem; font-size: 1rem; border: 1px solid #9aa59e; }
  .row { display: flex; gap: 1rem; } .row > div { flex: 1; }
  button { margin-top: 1rem; width: 100%; padding: .65rem; font-size: 1rem; background: #24594a; color: #fff; border: 0; cursor: pointer; }
  .result { padding: .6rem .75rem; margin: 1rem 0; }
  .result[data-outcome="paid"] { background: #e1f3e6; border: 1px solid #4c9a63; }
  .result[data-outcome="declined"], .result[data-outcome="card_error"], .result[data-outcome="not_payable"] { background: #fbe5e2; border: 1px solid #b5473a; }
  details { margin-top: 1.25rem; font-size: .85rem; color: #55605a; }
  code { font-size: .85rem; }
`;

function page(title: string, body: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)}</title><style>${STYLE}</style></head>
<body><main>
<p class="test">Test mode: this page stands in for the payment service during development and demos. No real card is charged.</p>
${body}
</main></body></html>`;
}

function resultBlock(result: PayResult | undefined, paidText: string): string {
  if (!result) return "";
  const text =
    result.outcome === "paid"
      ? paidText
      : result.outcome === "declined"
        ? `${result.message} (${result.declineCode ?? result.code})`
        : result.message;
  const decline = result.outcome === "declined" ? ` data-decline-code="${esc(result.declineCode ?? result.code)}"` : "";
  return `<p id="payment-result" class="result" role="alert" data-outcome="${result.outcome}"${decline}>${esc(text)}</p>`;
}

function cardForm(action: string, amount: string): string {
  return `<form method="post" action="${esc(action)}" id="payment-form">
  <label for="card-number">Card number</label>
  <input id="card-number" name="card_number" inputmode="numeric" autocomplete="cc-number" placeholder="4242 4242 4242 4242" required>
  <div class="row">
    <div><label for="card-expiry">Expiry (MM/YY)</label><input id="card-expiry" name="exp" autocomplete="cc-exp" placeholder="12/30" required></div>
    <div><label for="card-cvc">Security code</label><input id="card-cvc" name="cvc" inputmode="numeric" autocomplete="cc-csc" placeholder="123" required></div>
  </div>
  <button type="submit" id="pay-button">Pay ${esc(amount)}</button>
</form>
<details><summary>Test card numbers</summary>
<p>Any future expiry date and any three-digit code (four for American Express) will do.</p>
<ul>
  <li><code>4242 4242 4242 4242</code> — succeeds</li>
  <li><code>4000 0000 0000 0002</code> — declined (generic_decline)</li>
  <li><code>4000 0000 0000 9995</code> — declined (insufficient_funds)</li>
  <li><code>4000 0000 0000 0069</code> — declined (expired_card)</li>
</ul></details>`;
}

// A link back to the caller's site, from metadata[return_url] (a convenience of this fake only).
function returnLink(url: string | undefined): string {
  if (!url) return "";
  try {
    const u = new URL(url);
    if (u.protocol !== "http:" && u.protocol !== "https:") return "";
    return `<p><a id="return-link" href="${esc(u.toString())}">Back to ${esc(u.host)}</a></p>`;
  } catch {
    return "";
  }
}

export function invoicePage(ctx: Ctx, row: InvoiceRow, result?: PayResult): string {
  const o = row.obj;
  const cur = o.currency;
  const lines = invoiceLines(ctx.state, row)
    .map((l) => `<tr><td>${esc(l.description ?? "")}</td><td class="num">${esc(l.quantity ?? "")}</td><td class="num">${esc(formatAmount(l.amount, cur))}</td></tr>`)
    .join("");
  const summary = [`<tr><td colspan="2">Total</td><td class="num">${esc(formatAmount(o.total, cur))}</td></tr>`];
  if (o.pre_payment_credit_notes_amount > 0) summary.push(`<tr><td colspan="2">Credited</td><td class="num">−${esc(formatAmount(o.pre_payment_credit_notes_amount, cur))}</td></tr>`);
  if (o.starting_balance !== 0 && o.ending_balance !== null) {
    summary.push(`<tr><td colspan="2">Account balance applied</td><td class="num">${esc(formatAmount(o.starting_balance - o.ending_balance, cur))}</td></tr>`);
  }
  if (o.amount_paid > 0) summary.push(`<tr><td colspan="2">Paid</td><td class="num">−${esc(formatAmount(o.amount_paid, cur))}</td></tr>`);
  summary.push(`<tr class="due"><td colspan="2">Amount due</td><td class="num" id="amount-due">${esc(formatAmount(o.amount_remaining, cur))}</td></tr>`);
  const payable = (o.status === "open" || o.status === "uncollectible") && o.amount_remaining > 0;
  const state =
    o.status === "paid"
      ? `<p id="invoice-status" data-status="paid">Paid${o.status_transitions.paid_at ? ` on ${esc(day(o.status_transitions.paid_at))}` : ""}. Nothing more is due.</p>`
      : o.status === "void"
        ? `<p id="invoice-status" data-status="void">This invoice was voided; nothing is due.</p>`
        : `<p id="invoice-status" data-status="${esc(o.status)}">${o.due_date ? `Due ${esc(day(o.due_date))}.` : "Due on receipt."}</p>`;
  const body = `<h1>Test payment page</h1>
<p class="payee">${esc(ctx.config.accountName)} · Invoice ${esc(o.number ?? o.id)}</p>
${state}
<table><thead><tr><th>Description</th><th class="num">Qty</th><th class="num">Amount</th></tr></thead>
<tbody>${lines}${summary.join("")}</tbody></table>
${resultBlock(result, `Payment received: invoice ${o.number ?? o.id} is paid.`)}
${payable ? cardForm(`/hosted/invoices/${o.id}`, formatAmount(o.amount_remaining, cur)) : ""}
${o.status === "paid" ? returnLink(o.metadata?.return_url) : ""}
<p><a href="/hosted/invoices/${esc(o.id)}/pdf">Download the invoice (PDF)</a></p>`;
  return page("Test payment page", body);
}

export function checkoutPage(ctx: Ctx, row: CheckoutSessionRow, result?: PayResult): string {
  const o = row.obj;
  const cur = o.currency ?? ctx.config.defaultCurrency;
  const lines = row.lineItems
    .map((l) => `<tr><td>${esc(l.description ?? "")}</td><td class="num">${esc(l.quantity ?? "")}</td><td class="num">${esc(formatAmount(l.amount_total, cur))}</td></tr>`)
    .join("");
  const total = `<tr class="due"><td colspan="2">Total</td><td class="num" id="amount-due">${esc(formatAmount(o.amount_total ?? 0, cur))}</td></tr>`;
  const open = o.status === "open" && ctx.now < o.expires_at;
  const success = successLink(row);
  const after =
    o.status === "complete"
      ? success
        ? `<p><a id="return-link" href="${esc(success)}">Continue</a></p>`
        : ""
      : open && o.cancel_url
        ? `<p><a id="cancel-link" href="${esc(o.cancel_url)}">Cancel and go back</a></p>`
        : "";
  const state =
    o.status === "complete"
      ? `<p id="session-status" data-status="complete">Paid. Thank you.</p>`
      : open
        ? `<p id="session-status" data-status="open">Awaiting payment.</p>`
        : `<p id="session-status" data-status="expired">This payment page has expired.</p>`;
  const body = `<h1>Test payment page</h1>
<p class="payee">${esc(ctx.config.accountName)}</p>
${state}
<table><thead><tr><th>Item</th><th class="num">Qty</th><th class="num">Amount</th></tr></thead><tbody>${lines}${total}</tbody></table>
${resultBlock(result, "Payment received.")}
${open ? cardForm(`/hosted/checkout/${o.id}`, formatAmount(o.amount_total ?? 0, cur)) : ""}
${after}`;
  return page("Test payment page", body);
}
