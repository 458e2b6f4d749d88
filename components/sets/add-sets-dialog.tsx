"use client";

import { useQueryClient } from "@tanstack/react-query";
import { Plus } from "lucide-react";
import { useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { createSetsAction } from "@/lib/sets/actions";
import { createSetsSchema, MAX_SETS_PER_BATCH } from "@/lib/sets/schemas";
import type { SetCustomerOption } from "@/lib/sets/service";

type FormInput = z.input<typeof createSetsSchema>;
type FormOutput = z.output<typeof createSetsSchema>;

/** Add sets: a customer, one of its set types, the site the sets live at, and how many. */
export function AddSetsDialog({ customers }: { customers: SetCustomerOption[] }) {
  const queryClient = useQueryClient();
  const choices = customers.filter((c) => c.active);
  const dialog = useFormDialog({
    schema: createSetsSchema,
    defaults: (): FormInput => ({ organisationId: "", setTypeId: "", homeSiteId: "", count: 1 }),
    clearErrorOnClose: true,
    submit: (_values, parsed: FormOutput) => createSetsAction(parsed),
    onSuccess: async ({ ids, firstSerial, lastSerial }) => {
      toast.success(ids.length === 1 ? `Added set ${firstSerial}` : `Added ${ids.length} sets, ${firstSerial} to ${lastSerial}`);
      await queryClient.invalidateQueries({ queryKey: ["sets"] });
      dialog.form.reset();
    },
  });
  const {
    register,
    control,
    setValue,
    formState: { errors },
  } = dialog.form;
  const organisationId = Number(useWatch({ control, name: "organisationId" }));
  const customer = choices.find((c) => c.id === organisationId);
  const setTypes = customer?.setTypes.filter((t) => t.active) ?? [];
  const sites = customer?.sites.filter((s) => s.active) ?? [];

  return (
    <FormDialog
      dialog={dialog}
      trigger={
        <Button>
          <Plus className="h-4 w-4" aria-hidden="true" />
          Add sets
        </Button>
      }
      title="Add sets"
      description="Each new set gets the customer's next serial and its own GS1 identifier, ready for its label."
      submitLabel="Add sets"
      submittingLabel="Adding…"
    >
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
    </FormDialog>
  );
}
