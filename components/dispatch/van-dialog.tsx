"use client";

import { useRouter } from "next/navigation";
import type { ReactNode } from "react";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { createVanAction, updateVanAction } from "@/lib/dispatch/actions";
import { type VanFields, type VanInput, vanSchema } from "@/lib/dispatch/schemas";

export interface VanSubject {
  id: number;
  code: string;
  name: string;
  registration: string;
  soiledCapacityCarts: number;
  cleanCapacityCarts: number;
  active: boolean;
}

const defaults = (van?: VanSubject): VanInput => ({
  code: van?.code ?? "",
  name: van?.name ?? "",
  registration: van?.registration ?? "",
  soiledCapacityCarts: van ? String(van.soiledCapacityCarts) : "3",
  cleanCapacityCarts: van ? String(van.cleanCapacityCarts) : "3",
  active: van?.active ?? true,
});

/** Add a van, or change one: code, name, registration and its two compartments in carts. */
export function VanDialog({ trigger, van }: { trigger: ReactNode; van?: VanSubject }) {
  const router = useRouter();
  const dialog = useFormDialog({
    schema: vanSchema,
    defaults: () => defaults(van),
    resetOnOpen: true,
    submit: (values: VanInput) => (van ? updateVanAction({ ...values, id: van.id }) : createVanAction(values)),
    onSuccess: (_data, parsed: VanFields) => {
      toast.success(van ? `${parsed.code} saved` : `${parsed.code} added`);
      router.refresh();
    },
  });
  const {
    register,
    formState: { errors },
  } = dialog.form;

  return (
    <FormDialog dialog={dialog} trigger={trigger} title={van ? `Change van ${van.code}` : "Add a van"}>
      <div className="grid gap-4 sm:grid-cols-[8rem_1fr]">
        <Field id="van-code" label="Code" hint="On the van's side, e.g. V5" error={errors.code?.message}>
          <Input id="van-code" autoComplete="off" aria-invalid={!!errors.code} {...register("code")} />
        </Field>
        <Field id="van-name" label="Name" error={errors.name?.message}>
          <Input id="van-name" autoComplete="off" aria-invalid={!!errors.name} {...register("name")} />
        </Field>
      </div>
      <Field id="van-registration" label="Registration" error={errors.registration?.message}>
        <Input id="van-registration" autoComplete="off" aria-invalid={!!errors.registration} {...register("registration")} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="van-soiled" label="Soiled compartment (carts)" error={errors.soiledCapacityCarts?.message}>
          <Input id="van-soiled" inputMode="numeric" aria-invalid={!!errors.soiledCapacityCarts} {...register("soiledCapacityCarts")} />
        </Field>
        <Field id="van-clean" label="Clean compartment (carts)" error={errors.cleanCapacityCarts?.message}>
          <Input id="van-clean" inputMode="numeric" aria-invalid={!!errors.cleanCapacityCarts} {...register("cleanCapacityCarts")} />
        </Field>
      </div>
      <label className="flex items-center gap-2 text-sm">
        <input type="checkbox" {...register("active")} /> In service (can be given to a driver&apos;s shift)
      </label>
      <div className="flex justify-end gap-2">
        <Button type="submit">{van ? "Save" : "Add van"}</Button>
      </div>
    </FormDialog>
  );
}
