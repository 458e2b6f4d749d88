"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { saveSellerDetailsAction } from "./actions";
import { type SellerDetailsForm, type SellerDetailsInput, sellerDetailsSchema } from "./schemas";

/** The unit's VAT number and accounts address, as every e-invoice carries them. */
export function SellerDetailsFormView({ initial, editable }: { initial: { vatId: string | null; billingEmail: string | null }; editable: boolean }) {
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<SellerDetailsInput, unknown, SellerDetailsForm>({
    resolver: zodResolver(sellerDetailsSchema),
    defaultValues: { vatId: initial.vatId ?? "", billingEmail: initial.billingEmail ?? "" },
  });
  const onSubmit = async (values: SellerDetailsForm) => {
    setFormError(null);
    const result = await saveSellerDetailsAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success("Saved. New exports carry these details.");
    reset({ vatId: result.data.vatId ?? "", billingEmail: result.data.billingEmail ?? "" });
  };
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <FormError message={formError} />
      <fieldset disabled={!editable || isSubmitting} className="grid gap-4 sm:grid-cols-2">
        <Field id="seller-vat" label="VAT number" hint="Required on standard-rated e-invoices (EN 16931 rule BR-S-02)." error={errors.vatId?.message}>
          <Input id="seller-vat" autoComplete="off" aria-invalid={!!errors.vatId} {...register("vatId")} />
        </Field>
        <Field id="seller-email" label="Accounts e-mail address" hint="The seller's electronic address on e-invoices." error={errors.billingEmail?.message}>
          <Input id="seller-email" type="email" autoComplete="off" aria-invalid={!!errors.billingEmail} {...register("billingEmail")} />
        </Field>
        {editable && (
          <div className="sm:col-span-2">
            <Button type="submit" size="sm" disabled={!isDirty}>
              {isSubmitting ? "Saving…" : "Save details"}
            </Button>
          </div>
        )}
      </fieldset>
    </form>
  );
}
