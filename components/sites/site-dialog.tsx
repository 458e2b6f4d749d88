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
import { Input, Textarea } from "@/components/ui/input";
import { weeklyHours } from "@/lib/sites/opening-hours";
import { createSiteAction, updateSiteAction } from "@/lib/sites/actions";
import type { SiteView } from "@/lib/sites/queries";
import { type SiteFields, type SiteInput, siteSchema } from "@/lib/sites/schemas";
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
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const router = useRouter();
  const queryClient = useQueryClient();
  const {
    register,
    control,
    handleSubmit,
    reset,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<SiteInput, unknown, SiteFields>({ resolver: zodResolver(siteSchema), defaultValues: defaults(organisationId, site) });

  // The form's own values go to the server, which parses them again with the same schema.
  const onSubmit = async () => {
    const values = getValues();
    setFormError(null);
    const result = site ? await updateSiteAction({ ...values, id: site.id }) : await createSiteAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(site ? "Site saved" : "Site added");
    await queryClient.invalidateQueries({ queryKey: ["sites"] });
    if (!site) reset(defaults(organisationId));
    setOpen(false);
    router.refresh();
  };

  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>{trigger}</DialogTrigger>
      <DialogContent title={site ? `Edit ${site.name}` : "New site"} className="max-w-2xl">
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
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
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Saving…" : site ? "Save site" : "Add site"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
