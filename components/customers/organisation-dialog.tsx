"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { type ReactNode, useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { createCustomerAction, updateOrganisationAction } from "@/lib/organisations/actions";
import { type OrganisationInput, organisationSchema } from "@/lib/organisations/schemas";
import type { z } from "zod";

/** Create a customer, or edit an organisation's name, short code and billing address. */
export function OrganisationDialog({
  trigger,
  organisation,
}: {
  trigger: ReactNode;
  organisation?: { id: number; name: string; shortCode: string; billingEmail: string | null };
}) {
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const router = useRouter();
  const queryClient = useQueryClient();
  const {
    register,
    handleSubmit,
    reset,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<OrganisationInput, unknown, z.output<typeof organisationSchema>>({
    resolver: zodResolver(organisationSchema),
    defaultValues: {
      name: organisation?.name ?? "",
      shortCode: organisation?.shortCode ?? "",
      billingEmail: organisation?.billingEmail ?? "",
    },
  });

  // The form's own values go to the server, which parses them again with the same schema.
  const onSubmit = async () => {
    const values = getValues();
    setFormError(null);
    const result = organisation
      ? await updateOrganisationAction({ ...values, id: organisation.id })
      : await createCustomerAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(organisation ? "Saved" : `${values.name} added`);
    await queryClient.invalidateQueries({ queryKey: ["organisations"] });
    setOpen(false);
    if (!organisation) {
      reset();
      router.push(`/unit/customers/${result.data.id}`);
    } else {
      router.refresh();
    }
  };

  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>{trigger}</DialogTrigger>
      <DialogContent title={organisation ? "Edit organisation" : "New customer"} description="The short code appears in the serials of the customer's sets.">
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
            <Field id="org-name" label="Name" error={errors.name?.message}>
              <Input id="org-name" aria-invalid={!!errors.name} {...register("name")} />
            </Field>
            <Field id="org-code" label="Short code" hint="2–6 capital letters or digits, e.g. QMH." error={errors.shortCode?.message}>
              <Input id="org-code" className="uppercase" aria-invalid={!!errors.shortCode} {...register("shortCode")} />
            </Field>
            <Field id="org-billing" label="Billing e-mail (optional)" error={errors.billingEmail?.message}>
              <Input id="org-billing" type="email" aria-invalid={!!errors.billingEmail} {...register("billingEmail")} />
            </Field>
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Saving…" : organisation ? "Save" : "Add customer"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
