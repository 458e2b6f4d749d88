"use client";

import { CalendarX } from "lucide-react";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
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
  const dialog = useFormDialog({
    schema: endContractSchema,
    defaults: (): Input => ({ id: contractId, validUntil: validUntil ?? suggestedLastDay }),
    submit: (_values, parsed: Output) => endContractAction(parsed),
    onSuccess: (_data, parsed) => {
      toast.success(`${reference} now ends on ${formatLocalDate(parsed.validUntil)}`);
      router.refresh();
    },
  });
  const {
    register,
    formState: { errors },
  } = dialog.form;

  const title = validUntil === null ? "End this version" : "Change the last day";
  return (
    <FormDialog
      dialog={dialog}
      trigger={
        <Button variant="secondary">
          <CalendarX className="h-4 w-4" aria-hidden="true" />
          {title}
        </Button>
      }
      title={`${title}: ${reference}`}
      description={`Its terms apply up to and including the last day (local date). It started on ${formatLocalDate(validFrom)}. The next version can start the day after.`}
      submitLabel="Save last day"
    >
      <input type="hidden" {...register("id")} />
      <Field id="end-valid-until" label="Last day" error={errors.validUntil?.message}>
        <Input id="end-valid-until" type="date" aria-invalid={!!errors.validUntil} {...register("validUntil")} />
      </Field>
      <p className="text-xs text-muted">The change is recorded with the previous last day. Invoices already issued keep their amounts.</p>
    </FormDialog>
  );
}
