"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import type { ReactNode } from "react";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Field } from "@/components/ui/field";
import { Input, Textarea } from "@/components/ui/input";
import { weeklyHours } from "@/lib/sites/opening-hours";
import { createSiteAction, updateSiteAction } from "@/lib/sites/actions";
import type { SiteView } from "@/lib/sites/queries";
import { type SiteInput, siteSchema } from "@/lib/sites/schemas";
import { OpeningHoursEditor } from "./opening-hours-editor";

function defaults(organisationId: number, site?: SiteView): SiteInput {
  return {
    organisationId,
    name: site?.name ?? "",
    addressLine1: site?.addressLine1 ?? "",
    addressLine2: site?.addressLine2 ?? "",
    town: site?.town ?? "",
    postcode: site?.postcode ?? "",
    latitude: site?.latitude ?? "",
    longitude: site?.longitude ?? "",
    openingHours: site?.openingHours ?? weeklyHours(["mon", "tue", "wed", "thu", "fri"], "08:00", "18:00"),
    deliveryNotes: site?.deliveryNotes ?? "",
    contactName: site?.contactName ?? "",
    contactPhone: site?.contactPhone ?? "",
    contactEmail: site?.contactEmail ?? "",
  };
}

/** Add a site to an organisation, or edit one. */
export function SiteDialog({ trigger, organisationId, site }: { trigger: ReactNode; organisationId: number; site?: SiteView }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  // The form's own values go to the server, which parses them again with the same schema.
  const dialog = useFormDialog({
    schema: siteSchema,
    defaults: () => defaults(organisationId, site),
    submit: (values: SiteInput) => (site ? updateSiteAction({ ...values, id: site.id }) : createSiteAction(values)),
    onSuccess: async () => {
      toast.success(site ? "Site saved" : "Site added");
      await queryClient.invalidateQueries({ queryKey: ["sites"] });
      if (!site) dialog.form.reset(defaults(organisationId));
      router.refresh();
    },
  });
  const {
    register,
    control,
    formState: { errors },
  } = dialog.form;

  return (
    <FormDialog
      dialog={dialog}
      trigger={trigger}
      title={site ? `Edit ${site.name}` : "New site"}
      className="max-w-2xl"
      submitLabel={site ? "Save site" : "Add site"}
    >
      <Field id="site-name" label="Site name" error={errors.name?.message}>
        <Input id="site-name" aria-invalid={!!errors.name} {...register("name")} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="site-address1" label="Street address" error={errors.addressLine1?.message}>
          <Input id="site-address1" aria-invalid={!!errors.addressLine1} {...register("addressLine1")} />
        </Field>
        <Field id="site-address2" label="Address, second line (optional)" error={errors.addressLine2?.message}>
          <Input id="site-address2" {...register("addressLine2")} />
        </Field>
        <Field id="site-town" label="Town" error={errors.town?.message}>
          <Input id="site-town" aria-invalid={!!errors.town} {...register("town")} />
        </Field>
        <Field id="site-postcode" label="Postcode" error={errors.postcode?.message}>
          <Input id="site-postcode" aria-invalid={!!errors.postcode} {...register("postcode")} />
        </Field>
        <Field id="site-lat" label="Latitude" hint="Decimal degrees, e.g. 53.7012" error={errors.latitude?.message}>
          <Input id="site-lat" inputMode="decimal" aria-invalid={!!errors.latitude} {...register("latitude")} />
        </Field>
        <Field id="site-lon" label="Longitude" hint="Decimal degrees, e.g. -1.5023" error={errors.longitude?.message}>
          <Input id="site-lon" inputMode="decimal" aria-invalid={!!errors.longitude} {...register("longitude")} />
        </Field>
      </div>
      <OpeningHoursEditor control={control} register={register} errors={errors} />
      <Field id="site-notes" label="Delivery notes for drivers (optional)" error={errors.deliveryNotes?.message}>
        <Textarea id="site-notes" {...register("deliveryNotes")} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="site-contact" label="Contact (optional)" error={errors.contactName?.message}>
          <Input id="site-contact" {...register("contactName")} />
        </Field>
        <Field id="site-phone" label="Phone (optional)" error={errors.contactPhone?.message}>
          <Input id="site-phone" type="tel" {...register("contactPhone")} />
        </Field>
        <Field id="site-email" label="E-mail (optional)" error={errors.contactEmail?.message}>
          <Input id="site-email" type="email" {...register("contactEmail")} />
        </Field>
      </div>
    </FormDialog>
  );
}
