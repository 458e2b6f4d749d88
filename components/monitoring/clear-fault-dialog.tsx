"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { clearFaultAction } from "@/lib/monitoring/actions";
import { type ClearFaultInput, clearFaultSchema } from "@/lib/monitoring/schemas";

/** Clears an open fault, putting the machine back in use (quality lead). */
export function ClearFaultDialog({ faultId, machineCode }: { faultId: number; machineCode: string }) {
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const router = useRouter();
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<ClearFaultInput>({ resolver: zodResolver(clearFaultSchema), defaultValues: { id: faultId, note: "" } });

  const onSubmit = async (values: ClearFaultInput) => {
    setFormError(null);
    const result = await clearFaultAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(`${machineCode} is back in use`);
    setOpen(false);
    reset({ id: faultId, note: "" });
    router.refresh();
  };

  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>
        <Button size="sm" variant="secondary">
          Clear fault
        </Button>
      </DialogTrigger>
      <DialogContent title={`Clear the fault on ${machineCode}`} description="The machine goes back into use once the fault is cleared. Clear it only when the repair has been checked as the unit's procedures require.">
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
            <input type="hidden" {...register("id")} />
            <Field id={`clear-note-${faultId}`} label="How it was cleared" error={errors.note?.message}>
              <Textarea id={`clear-note-${faultId}`} rows={3} aria-invalid={!!errors.note} {...register("note")} />
            </Field>
            <div className="flex justify-end gap-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Clearing…" : "Clear fault"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
