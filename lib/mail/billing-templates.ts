import { formatMoney } from "@/lib/contracts/format";
import { escapeHtml, mailButton, mailFrame } from "./html";
import type { RenderedMail } from "./templates";

// The billing e-mails to a customer's clinic managers: the receipt for an invoice paid online and
// the reminder of an overdue invoice. Everything from the database is escaped in the HTML.

export interface ReceiptMailInput {
  recipientName: string;
  organisationName: string;
  invoiceNumber: string;
  amountPaidMinor: number;
  currency: string;
  paidOn: string;
  link: string;
}

export function paymentReceiptMail(input: ReceiptMailInput): RenderedMail {
  const amount = formatMoney(input.amountPaidMinor, input.currency);
  const subject = `Payment received for invoice ${input.invoiceNumber}`;
  const text = [
    `Hello ${input.recipientName},`,
    "",
    `Thank you: we have received ${amount} for invoice ${input.invoiceNumber} (${input.organisationName}), paid online on ${input.paidOn}.`,
    "Nothing more is due on this invoice.",
    "",
    `See the invoice and download it: ${input.link}`,
  ].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(input.recipientName)},</p>
<p>Thank you: we have received <strong>${escapeHtml(amount)}</strong> for invoice <strong>${escapeHtml(input.invoiceNumber)}</strong> (${escapeHtml(input.organisationName)}), paid online on ${escapeHtml(input.paidOn)}.</p>
<p>Nothing more is due on this invoice.</p>
${mailButton(input.link, "See the invoice")}`,
  );
  return { subject, text, html };
}

export interface ReminderMailInput {
  recipientName: string;
  organisationName: string;
  invoiceNumber: string;
  amountDueMinor: number;
  currency: string;
  dueOn: string;
  daysOverdue: number;
  link: string;
}

export function invoiceReminderMail(input: ReminderMailInput): RenderedMail {
  const amount = formatMoney(input.amountDueMinor, input.currency);
  const days = `${input.daysOverdue} day${input.daysOverdue === 1 ? "" : "s"}`;
  const subject = `Reminder: invoice ${input.invoiceNumber} is ${days} overdue`;
  const text = [
    `Hello ${input.recipientName},`,
    "",
    `Invoice ${input.invoiceNumber} for ${input.organisationName} was due on ${input.dueOn}; ${amount} is still to pay.`,
    "You can pay it online from the invoice page. If you have already paid, thank you, and please ignore this reminder.",
    "",
    `Open the invoice: ${input.link}`,
  ].join("\n");
  const html = mailFrame(
    subject,
    `<p>Hello ${escapeHtml(input.recipientName)},</p>
<p>Invoice <strong>${escapeHtml(input.invoiceNumber)}</strong> for ${escapeHtml(input.organisationName)} was due on ${escapeHtml(input.dueOn)}; <strong>${escapeHtml(amount)}</strong> is still to pay.</p>
<p>You can pay it online from the invoice page. If you have already paid, thank you, and please ignore this reminder.</p>
${mailButton(input.link, "Open the invoice")}`,
  );
  return { subject, text, html };
}
