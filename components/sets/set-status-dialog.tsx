"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { changeSetStatusAction } from "@/lib/sets/actions";
import { changeSetStatusSchema, type SetStatus } from "@/lib/sets/schemas";

type FormInput = z.input<typeof changeSetStatusSchema>;
type FormOutput = z.output<typeof changeSetStatusSchema>;

/** Retire a set, or return a retired one to service; the reason goes into the set's record. Key it by `status`. */
export function SetStatusDialog({ setId, serial, status }: { setId: number; serial: string; status: SetStatus }) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const next: SetStatus = status === "in_service" ? "retired" : "in_service";
  const retiring = next === "retired";
  const {
    register,
    handleSubmit,
    reset,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormInput, unknown, FormOutput>({
    resolver: zodResolver(changeSetStatusSchema),
    defaultValues: { setId, status: next, reason: "" },
  });

  const onSubmit = async (values: FormOutput) => {
    setFormError(null);
    const result = await changeSetStatusAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(retiring ? `${serial} is retired` : `${serial} is back in service`);
    setOpen(false);
    reset();
    // The page renders the dialog again, keyed by the new status.
    router.refresh();
  };

  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>
        <Button variant={retiring ? "secondary" : "primary"}>{retiring ? "Retire this set" : "Return to service"}</Button>
      </DialogTrigger>
      <DialogContent
        title={retiring ? `Retire ${serial}` : `Return ${serial} to service`}
        description={
          retiring
            ? "A retired set stays on record with its history but is no longer in use. You can return it to service later."
            : "The set is in use again under the same serial and GS1 identifier."
        }
      >
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
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
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit" variant={retiring ? "danger" : "primary"}>
                {isSubmitting ? "Saving…" : retiring ? "Retire set" : "Return to service"}
              </Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
