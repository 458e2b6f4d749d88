"use client";

import { useRouter } from "next/navigation";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { changeSetStatusAction } from "@/lib/sets/actions";
import { changeSetStatusSchema, type SetStatus } from "@/lib/sets/schemas";

type FormInput = z.input<typeof changeSetStatusSchema>;
type FormOutput = z.output<typeof changeSetStatusSchema>;

/** Retire a set, or return a retired one to service; the reason goes into the set's record. Key it by `status`. */
export function SetStatusDialog({ setId, serial, status }: { setId: number; serial: string; status: SetStatus }) {
  const router = useRouter();
  const next: SetStatus = status === "in_service" ? "retired" : "in_service";
  const retiring = next === "retired";
  const dialog = useFormDialog({
    schema: changeSetStatusSchema,
    defaults: (): FormInput => ({ setId, status: next, reason: "" }),
    submit: (_values, parsed: FormOutput) => changeSetStatusAction(parsed),
    onSuccess: () => {
      toast.success(retiring ? `${serial} is retired` : `${serial} is back in service`);
      dialog.form.reset();
      // The page renders the dialog again, keyed by the new status.
      router.refresh();
    },
  });
  const {
    register,
    formState: { errors },
  } = dialog.form;

  return (
    <FormDialog
      dialog={dialog}
      trigger={<Button variant={retiring ? "secondary" : "primary"}>{retiring ? "Retire this set" : "Return to service"}</Button>}
      title={retiring ? `Retire ${serial}` : `Return ${serial} to service`}
      description={
        retiring
          ? "A retired set stays on record with its history but is no longer in use. You can return it to service later."
          : "The set is in use again under the same serial and GS1 identifier."
      }
      submitLabel={retiring ? "Retire set" : "Return to service"}
      submitVariant={retiring ? "danger" : "primary"}
    >
      <input type="hidden" {...register("setId")} />
      <input type="hidden" {...register("status")} />
      <Field
        id="set-status-reason"
        label="Reason"
        hint={retiring ? "For example: lid hinge cracked, replaced by a new container." : "For example: repaired and inspected."}
        error={errors.reason?.message}
      >
        <Textarea id="set-status-reason" aria-invalid={!!errors.reason} {...register("reason")} />
      </Field>
    </FormDialog>
  );
}
