"use server";

import { revalidatePath } from "next/cache";
import { createCreditNote, describeCreditNote } from "@/lib/billing/credit-notes";
import { closeInvoice } from "@/lib/billing/payments";
import { defineAction } from "@/lib/http/action";
import { closeInvoiceFormSchema, creditNoteFormSchema, decimalToMinor } from "./schemas";

// Finance's changes to one invoice: a credit note, voiding it or writing it off.

export const createCreditNoteAction = defineAction("billing.manage", creditNoteFormSchema, async ({ db, user }, input) => {
  const settlement = input.settlement === "" ? undefined : input.settlement;
  const note = await createCreditNote(
    db,
    user,
    input.invoiceId,
    input.kind === "lines"
      ? {
          kind: "lines",
          lines: input.lines.filter((l) => Number(l.quantity) > 0).map((l) => ({ lineId: l.lineId, quantity: Number(l.quantity) })),
          reason: input.reason,
          settlement,
        }
      : { kind: "amount", amountMinor: decimalToMinor(input.amount), description: input.description, reason: input.reason, settlement },
  );
  const invoice = await db.selectFrom("invoices").select("currency").where("id", "=", input.invoiceId).executeTakeFirstOrThrow();
  revalidatePath(`/unit/billing/invoices/${input.invoiceId}`);
  return { ...note, message: describeCreditNote(note, invoice.currency) };
});

export const closeInvoiceAction = defineAction("billing.manage", closeInvoiceFormSchema, async ({ db, user }, input) => {
  const result = await closeInvoice(db, user, input.invoiceId, { to: input.to, reason: input.reason });
  revalidatePath(`/unit/billing/invoices/${input.invoiceId}`);
  return result;
});
