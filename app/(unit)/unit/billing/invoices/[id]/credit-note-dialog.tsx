"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { ReceiptText } from "lucide-react";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
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
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const router = useRouter();
  const queryClient = useQueryClient();
  const defaults: CreditNoteFormInput = {
    invoiceId,
    kind: lines.length > 0 ? "lines" : "amount",
    lines: lines.map((l) => ({ lineId: l.id, quantity: "" })),
    amount: "",
    description: "",
    reason: "",
    settlement: "",
  };
  const {
    register,
    control,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<CreditNoteFormInput, unknown, CreditNoteForm>({ resolver: zodResolver(creditNoteFormSchema), defaultValues: defaults });
  const kind = useWatch({ control, name: "kind" });

  const onSubmit = async (values: CreditNoteForm) => {
    setFormError(null);
    const result = await createCreditNoteAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(result.data.message);
    await queryClient.invalidateQueries({ queryKey: ["invoice", invoiceId] });
    router.refresh();
    reset(defaults);
    setOpen(false);
  };

  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>
        <Button variant="secondary" size="sm">
          <ReceiptText className="h-4 w-4" aria-hidden="true" /> Credit note
        </Button>
      </DialogTrigger>
      <DialogContent
        title="Credit note"
        description={
          paid
            ? "The invoice is paid: the credit is refunded to the card that paid, or repaid outside the payment service. VAT is credited at the invoice's rate."
            : "The credit is deducted from what is still due, here and in the payment service. VAT is credited at the invoice's rate."
        }
        className="max-w-2xl"
      >
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
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
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Crediting…" : "Create credit note"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
