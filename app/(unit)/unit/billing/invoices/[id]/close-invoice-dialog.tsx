"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { closeInvoiceAction } from "./actions";
import { type CloseInvoiceForm, closeInvoiceFormSchema } from "./schemas";

const WORDS = {
  void: {
    button: "Void",
    title: "Void this invoice",
    description: "For an invoice issued in error: it is cancelled here and in the payment service, and nothing is owed on it. This cannot be undone.",
    done: "The invoice is void.",
  },
  uncollectible: {
    button: "Write off",
    title: "Write this invoice off",
    description: "For a debt that will not be paid: it stays on record as written off and gets no more reminders. It can still be paid online.",
    done: "The invoice is written off.",
  },
} as const;

/** Void an invoice, or mark it uncollectible, with the reason. */
export function CloseInvoiceDialog({ invoiceId, to }: { invoiceId: number; to: "void" | "uncollectible" }) {
  const words = WORDS[to];
  const router = useRouter();
  const queryClient = useQueryClient();
  const dialog = useFormDialog({
    schema: closeInvoiceFormSchema,
    defaults: (): CloseInvoiceForm => ({ invoiceId, to, reason: "" }),
    submit: (_values, parsed) => closeInvoiceAction(parsed),
    onSuccess: async () => {
      toast.success(words.done);
      await queryClient.invalidateQueries({ queryKey: ["invoice", invoiceId] });
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
        <Button variant="ghost" size="sm">
          {words.button}
        </Button>
      }
      title={words.title}
      description={words.description}
      submitLabel={words.button}
      submitVariant="danger"
    >
      <Field id={`close-${to}-reason`} label="Reason" error={errors.reason?.message}>
        <Textarea id={`close-${to}-reason`} aria-invalid={!!errors.reason} {...register("reason")} />
      </Field>
    </FormDialog>
  );
}
