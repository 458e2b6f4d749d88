"use client";

import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { clearFaultAction } from "@/lib/monitoring/actions";
import { type ClearFaultInput, clearFaultSchema } from "@/lib/monitoring/schemas";

/** Clears an open fault, putting the machine back in use (quality lead). */
export function ClearFaultDialog({ faultId, machineCode }: { faultId: number; machineCode: string }) {
  const router = useRouter();
  const defaults = (): ClearFaultInput => ({ id: faultId, note: "" });
  const dialog = useFormDialog({
    schema: clearFaultSchema,
    defaults,
    submit: (_values, parsed) => clearFaultAction(parsed),
    onSuccess: () => {
      toast.success(`${machineCode} is back in use`);
      dialog.form.reset(defaults());
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
      trigger={
        <Button size="sm" variant="secondary">
          Clear fault
        </Button>
      }
      title={`Clear the fault on ${machineCode}`}
      description="The machine goes back into use once the fault is cleared. Clear it only when the repair has been checked as the unit's procedures require."
      submitLabel="Clear fault"
      submittingLabel="Clearing…"
    >
      <input type="hidden" {...register("id")} />
      <Field id={`clear-note-${faultId}`} label="How it was cleared" error={errors.note?.message}>
        <Textarea id={`clear-note-${faultId}`} rows={3} aria-invalid={!!errors.note} {...register("note")} />
      </Field>
    </FormDialog>
  );
}
