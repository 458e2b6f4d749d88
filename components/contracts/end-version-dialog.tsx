"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { CalendarX } from "lucide-react";
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
import { Input } from "@/components/ui/input";
import { endContractAction } from "@/lib/contracts/actions";
import { formatLocalDate } from "@/lib/contracts/format";
import { endContractSchema } from "@/lib/contracts/schemas";

type Input = z.input<typeof endContractSchema>;
type Output = z.output<typeof endContractSchema>;

/** Sets the last day of a version, e.g. before the next version starts. */
export function EndVersionDialog({
  contractId,
  reference,
  validFrom,
  validUntil,
  suggestedLastDay,
}: {
  contractId: number;
  reference: string;
  validFrom: string;
  validUntil: string | null;
  suggestedLastDay: string;
}) {
  const router = useRouter();
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Input, unknown, Output>({
    resolver: zodResolver(endContractSchema),
    defaultValues: { id: contractId, validUntil: validUntil ?? suggestedLastDay },
  });

  const onSubmit = async (values: Output) => {
    setFormError(null);
    const result = await endContractAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(`${reference} now ends on ${formatLocalDate(values.validUntil)}`);
    setOpen(false);
    router.refresh();
  };

  const title = validUntil === null ? "End this version" : "Change the last day";
  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>
        <Button variant="secondary">
          <CalendarX className="h-4 w-4" aria-hidden="true" />
          {title}
        </Button>
      </DialogTrigger>
      <DialogContent
        title={`${title}: ${reference}`}
        description={`Its terms apply up to and including the last day (local date). It started on ${formatLocalDate(validFrom)}. The next version can start the day after.`}
      >
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
            <input type="hidden" {...register("id")} />
            <Field id="end-valid-until" label="Last day" error={errors.validUntil?.message}>
              <Input id="end-valid-until" type="date" aria-invalid={!!errors.validUntil} {...register("validUntil")} />
            </Field>
            <p className="text-xs text-muted">The change is recorded with the previous last day. Invoices already issued keep their amounts.</p>
            <div className="flex justify-end gap-2 pt-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit">{isSubmitting ? "Saving…" : "Save last day"}</Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
