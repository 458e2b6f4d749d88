"use client";

import { useQueryClient } from "@tanstack/react-query";
import { ReceiptText } from "lucide-react";
import { useRouter } from "next/navigation";
import { useWatch } from "react-hook-form";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import { formatMoney } from "@/lib/contracts/format";
import { createCreditNoteAction } from "./actions";
import { type CreditNoteForm, type CreditNoteFormInput, creditNoteFormSchema } from "./schemas";

export interface CreditableLine {
  id: number;
  description: string;
  quantity: number;
  unitPriceMinor: number;
}

/** A credit note for a dispute: some units of the invoice's lines, or an amount. VAT is added as on the invoice. */
export function CreditNoteDialog({
  invoiceId,
  currency,
  lines,
  paid,
}: {
  invoiceId: number;
  currency: string;
  lines: CreditableLine[];
  /** The invoice is paid: the credit is refunded or settled outside the payment service. */
  paid: boolean;
}) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const defaults = (): CreditNoteFormInput => ({
    invoiceId,
    kind: lines.length > 0 ? "lines" : "amount",
    lines: lines.map((l) => ({ lineId: l.id, quantity: "" })),
    amount: "",
    description: "",
    reason: "",
    settlement: "",
  });
  const dialog = useFormDialog({
    schema: creditNoteFormSchema,
    defaults,
    submit: (_values, parsed: CreditNoteForm) => createCreditNoteAction(parsed),
    onSuccess: async ({ message }) => {
      toast.success(message);
      await queryClient.invalidateQueries({ queryKey: ["invoice", invoiceId] });
      router.refresh();
      dialog.form.reset(defaults());
    },
  });
  const {
    register,
    control,
    formState: { errors },
  } = dialog.form;
  const kind = useWatch({ control, name: "kind" });

  return (
    <FormDialog
      dialog={dialog}
      trigger={
        <Button variant="secondary" size="sm">
          <ReceiptText className="h-4 w-4" aria-hidden="true" /> Credit note
        </Button>
      }
      title="Credit note"
      description={
        paid
          ? "The invoice is paid: the credit is refunded to the card that paid, or repaid outside the payment service. VAT is credited at the invoice's rate."
          : "The credit is deducted from what is still due, here and in the payment service. VAT is credited at the invoice's rate."
      }
      className="max-w-2xl"
      submitLabel="Create credit note"
      submittingLabel="Crediting…"
    >
      <Field id="cn-kind" label="What to credit">
        <Select id="cn-kind" {...register("kind")}>
          {lines.length > 0 && <option value="lines">Units of the invoice&apos;s lines</option>}
          <option value="amount">An amount</option>
        </Select>
      </Field>
      {kind === "lines" ? (
        <div className="space-y-2" role="group" aria-labelledby="cn-lines-label">
          <p id="cn-lines-label" className="text-sm font-medium text-ink">
            Units to credit
          </p>
          {errors.lines?.message && (
            <p role="alert" className="text-xs font-medium text-danger-700">
              {errors.lines.message}
            </p>
          )}
          <ul className="max-h-72 space-y-2 overflow-y-auto pr-1">
            {lines.map((line, index) => (
              <li key={line.id} className="grid grid-cols-[1fr_6rem] items-center gap-3">
                <label htmlFor={`cn-line-${line.id}`} className="text-sm">
                  {line.description}
                  <span className="block text-xs text-muted">
                    {line.quantity} × {formatMoney(line.unitPriceMinor, currency)}
                  </span>
                </label>
                <Input
                  id={`cn-line-${line.id}`}
                  inputMode="numeric"
                  placeholder="0"
                  aria-invalid={!!errors.lines?.[index]?.quantity}
                  {...register(`lines.${index}.quantity`)}
                />
              </li>
            ))}
          </ul>
        </div>
      ) : (
        <div className="grid gap-4 sm:grid-cols-[10rem_1fr]">
          <Field id="cn-amount" label={`Amount before VAT (${currency})`} error={errors.amount?.message}>
            <Input id="cn-amount" inputMode="decimal" placeholder="25.00" aria-invalid={!!errors.amount} {...register("amount")} />
          </Field>
          <Field id="cn-description" label="Line on the credit note" error={errors.description?.message}>
            <Input id="cn-description" placeholder="Goodwill credit" aria-invalid={!!errors.description} {...register("description")} />
          </Field>
        </div>
      )}
      <Field id="cn-reason" label="Reason" hint="Shown on the credit note and kept in the audit log." error={errors.reason?.message}>
        <Textarea id="cn-reason" aria-invalid={!!errors.reason} {...register("reason")} />
      </Field>
      {paid && (
        <Field id="cn-settlement" label="Settle the credit" error={errors.settlement?.message}>
          <Select id="cn-settlement" {...register("settlement")}>
            <option value="">Refund to the card if it was paid online, otherwise outside the payment service</option>
            <option value="refund">Refund to the card that paid</option>
            <option value="out_of_band">Outside the payment service (bank transfer or set-off)</option>
          </Select>
        </Field>
      )}
    </FormDialog>
  );
}
