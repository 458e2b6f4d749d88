"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import type { ReactNode } from "react";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { createCustomerAction, updateOrganisationAction } from "@/lib/organisations/actions";
import { type OrganisationInput, organisationSchema } from "@/lib/organisations/schemas";

/** Create a customer, or edit an organisation's name, short code and billing address. */
export function OrganisationDialog({
  trigger,
  organisation,
}: {
  trigger: ReactNode;
  organisation?: { id: number; name: string; shortCode: string; billingEmail: string | null };
}) {
  const router = useRouter();
  const queryClient = useQueryClient();
  // The form's own values go to the server, which parses them again with the same schema.
  const dialog = useFormDialog({
    schema: organisationSchema,
    defaults: () => ({
      name: organisation?.name ?? "",
      shortCode: organisation?.shortCode ?? "",
      billingEmail: organisation?.billingEmail ?? "",
    }),
    submit: (values: OrganisationInput) =>
      organisation ? updateOrganisationAction({ ...values, id: organisation.id }) : createCustomerAction(values),
    onSuccess: async (data, _parsed, values) => {
      toast.success(organisation ? "Saved" : `${values.name} added`);
      await queryClient.invalidateQueries({ queryKey: ["organisations"] });
      if (!organisation) {
        dialog.form.reset();
        router.push(`/unit/customers/${data.id}`);
      } else {
        router.refresh();
      }
    },
  });
  const {
    register,
    formState: { errors },
  } = dialog.form;

  return (
    <FormDialog
      dialog={dialog}
      trigger={trigger}
      title={organisation ? "Edit organisation" : "New customer"}
      description="The short code appears in the serials of the customer's sets."
      submitLabel={organisation ? "Save" : "Add customer"}
    >
      <Field id="org-name" label="Name" error={errors.name?.message}>
        <Input id="org-name" aria-invalid={!!errors.name} {...register("name")} />
      </Field>
      <Field id="org-code" label="Short code" hint="2–6 capital letters or digits, e.g. QMH." error={errors.shortCode?.message}>
        <Input id="org-code" className="uppercase" aria-invalid={!!errors.shortCode} {...register("shortCode")} />
      </Field>
      <Field id="org-billing" label="Billing e-mail (optional)" error={errors.billingEmail?.message}>
        <Input id="org-billing" type="email" aria-invalid={!!errors.billingEmail} {...register("billingEmail")} />
      </Field>
    </FormDialog>
  );
}
