"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
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
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const router = useRouter();
  const queryClient = useQueryClient();
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<CloseInvoiceForm>({ resolver: zodResolver(closeInvoiceFormSchema), defaultValues: { invoiceId, to, reason: "" } });

  const onSubmit = async (values: CloseInvoiceForm) => {
    setFormError(null);
    const result = await closeInvoiceAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(words.done);
    await queryClient.invalidateQueries({ queryKey: ["invoice", invoiceId] });
    router.refresh();
    setOpen(false);
  };

  return (
    <Dialog open={open} onOpenChange={setOpen}>
      <DialogTrigger asChild>
        <Button variant="ghost" size="sm">
          {words.button}
        </Button>
      </DialogTrigger>
      <DialogContent title={words.title} description={words.description}>
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
            <Field id={`close-${to}-reason`} label="Reason" error={errors.reason?.message}>
              <Textarea id={`close-${to}-reason`} aria-invalid={!!errors.reason} {...register("reason")} />
            </Field>
            <div className="flex justify-end gap-2">
              <Button variant="secondary" onClick={() => setOpen(false)}>
                Cancel
              </Button>
              <Button type="submit" variant="danger">
                {isSubmitting ? "Saving…" : words.button}
              </Button>
            </div>
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
