import { z } from "zod";

// The forms of finance's invoice page, shared by the dialogs and the server actions.

const DECIMAL = /^\d{1,9}(\.\d{1,2})?$/;

/** "12.5" → 1250 minor units. */
export function decimalToMinor(text: string): number {
  const [whole, fraction = ""] = text.trim().split(".");
  return Number(whole) * 100 + Number(fraction.padEnd(2, "0"));
}

export const creditNoteFormSchema = z
  .object({
    invoiceId: z.number().int().positive(),
    kind: z.enum(["lines", "amount"]),
    lines: z.array(
      z.object({
        lineId: z.number().int().positive(),
        quantity: z
          .string()
          .trim()
          .regex(/^\d{0,6}$/, { error: "A whole number of units." }),
      }),
    ),
    amount: z.string().trim(),
    description: z.string().trim().max(200, { error: "At most 200 characters." }),
    reason: z.string().trim().min(3, { error: "Say why the credit is given (shown on the credit note)." }).max(500, { error: "At most 500 characters." }),
    settlement: z.enum(["", "refund", "out_of_band"]),
  })
  .superRefine((value, ctx) => {
    if (value.kind === "lines") {
      if (!value.lines.some((l) => Number(l.quantity) > 0)) {
        ctx.addIssue({ code: "custom", path: ["lines"], message: "Enter how many units of at least one line to credit." });
      }
      return;
    }
    if (!DECIMAL.test(value.amount) || decimalToMinor(value.amount) <= 0) {
      ctx.addIssue({ code: "custom", path: ["amount"], message: "An amount before VAT, such as 25.00." });
    }
    if (!value.description) ctx.addIssue({ code: "custom", path: ["description"], message: "Describe what is credited (the credit note's line)." });
  });

export type CreditNoteFormInput = z.input<typeof creditNoteFormSchema>;
export type CreditNoteForm = z.output<typeof creditNoteFormSchema>;

export const closeInvoiceFormSchema = z.object({
  invoiceId: z.number().int().positive(),
  to: z.enum(["void", "uncollectible"]),
  reason: z.string().trim().min(3, { error: "Say why (kept in the audit log)." }).max(500, { error: "At most 500 characters." }),
});
export type CloseInvoiceForm = z.output<typeof closeInvoiceFormSchema>;
