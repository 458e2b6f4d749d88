"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { Plus } from "lucide-react";
import { useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { createSetsAction } from "@/lib/sets/actions";
import { createSetsSchema, MAX_SETS_PER_BATCH } from "@/lib/sets/schemas";
import type { SetCustomerOption } from "@/lib/sets/service";

type FormInput = z.input<typeof createSetsSchema>;
type FormOutput = z.output<typeof createSetsSchema>;

/** Add sets: a customer, one of its set types, the site the sets live at, and how many. */
export function AddSetsDialog({ customers }: { customers: SetCustomerOption[] }) {
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const queryClient = useQueryClient();
  const choices = customers.filter((c) => c.active);
  const {
    register,
    handleSubmit,
    control,
    reset,
    setValue,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormInput, unknown, FormOutput>({
    resolver: zodResolver(createSetsSchema),
    defaultValues: { organisationId: "", setTypeId: "", homeSiteId: "", count: 1 },
  });
  const organisationId = Number(useWatch({ control, name: "organisationId" }));
  const customer = choices.find((c) => c.id === organisationId);
  const setTypes = customer?.setTypes.filter((t) => t.active) ?? [];
  const sites = customer?.sites.filter((s) => s.active) ?? [];

  const onSubmit = async (values: FormOutput) => {
    setFormError(null);
    const result = await createSetsAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    const { ids, firstSerial, lastSerial } = result.data;
    toast.success(ids.length === 1 ? `Added set ${firstSerial}` : `Added ${ids.length} sets, ${firstSerial} to ${lastSerial}`);
    await queryClient.invalidateQueries({ queryKey: ["sets"] });
    reset();
    setOpen(false);
  };

  return (
    <Dialog
      open={open}
      onOpenChange={(next) => {
        setOpen(next);
        if (!next) setFormError(null);
      }}
    >
      <DialogTrigger asChild>
        <Button>
          <Plus className="h-4 w-4" aria-hidden="true" />
          Add sets
        </Button>
      </DialogTrigger>
      <DialogContent
        title="Add sets"
        description="Each new set gets the customer's next serial and its own GS1 identifier, ready for its label."
      >
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
            <Field id="add-sets-customer" label="Customer" error={errors.organisationId?.message}>
              <Select
                id="add-sets-customer"
                aria-invalid={!!errors.organisationId}
                {...register("organisationId", {
                  onChange: () => {
                    setValue("setTypeId", "");
                    setValue("homeSiteId", "");
                  },
                })}
              >
                <option value="">Choose a customer</option>
                {choices.map((c) => (
                  <option key={c.id} value={c.id}>
                    {c.name}
                  </option>
                ))}
              </Select>
            </Field>
            <Field
              id="add-sets-type"
              label="Set type"
              hint={customer && setTypes.length === 0 ? "This customer's catalogue has no set types yet." : undefined}
              error={errors.setTypeId?.message}
            >
              <Select id="add-sets-type" aria-invalid={!!errors.setTypeId} disabled={!customer} {...register("setTypeId")}>
                <option value="">{customer ? "Choose a set type" : "Choose the customer first"}</option>
                {setTypes.map((t) => (
                  <option key={t.id} value={t.id}>
                    {t.name} ({t.code})
                  </option>
                ))}
              </Select>
            </Field>
            <Field id="add-sets-site" label="Home site" hint="The site the sets belong to and go back to." error={errors.homeSiteId?.message}>
              <Select id="add-sets-site" aria-invalid={!!errors.homeSiteId} disabled={!customer} {...register("homeSiteId")}>
                <option value="">{customer ? "Choose a site" : "Choose the customer first"}</option>
                {sites.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </Select>
            </Field>
            <Field id="add-sets-count" label="How many" hint={`From 1 to ${MAX_SETS_PER_BATCH} at a time.`} error={errors.count?.message}>
              <Input
                id="add-sets-count"
                type="number"
                inputMode="numeric"
                min={1}
                max={MAX_SETS_PER_BATCH}
                step={1}
                className="w-32"
                aria-invalid={!!errors.count}
                {...register("count")}
              />
            </Field>
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Adding…" : "Add sets"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
