"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { type ReactNode, useState } from "react";
import { type DefaultValues, type FieldValues, type UseFormReturn, useForm } from "react-hook-form";
import type { z } from "zod";
import { Button, type ButtonProps } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import type { ActionResult } from "@/lib/http/action";
import { applyFieldErrors } from "./apply-field-errors";
import { FormError } from "./form-error";

// A form in a dialog that a server action saves: react-hook-form checks it with the zod schema the
// action parses again, the action's field errors go under the fields and its message above them,
// the fields are disabled while it runs, and the dialog closes once it has succeeded.

export interface FormDialogState<I extends FieldValues, O> {
  form: UseFormReturn<I, unknown, O>;
  open: boolean;
  onOpenChange: (open: boolean) => void;
  close: () => void;
  formError: string | null;
  onSubmit: () => Promise<void>;
}

export function useFormDialog<I extends FieldValues, O, D>({
  schema,
  defaults,
  resetOnOpen = false,
  clearErrorOnClose = false,
  onOpen,
  submit,
  onSuccess,
}: {
  schema: z.ZodType<O, I>;
  /** The form's starting values; with `resetOnOpen` the form starts from them each time it opens. */
  defaults: () => I;
  resetOnOpen?: boolean;
  /** The action's message goes when the dialog is dismissed (Escape, its close button, outside); the values stay. */
  clearErrorOnClose?: boolean;
  /** Each time the dialog opens, after the reset of `resetOnOpen`: resets the dialog's own state (an upload). */
  onOpen?: () => void;
  /** Calls the action with the form's own values (the action parses them) or with the parsed ones. */
  submit: (values: I, parsed: O) => Promise<ActionResult<D>>;
  /** After the dialog has closed on success: the toast, a refresh or the way to the new record. */
  onSuccess: (data: D, parsed: O, values: I) => void | Promise<void>;
}): FormDialogState<I, O> {
  const [open, setOpen] = useState(false);
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<I, unknown, O>({ resolver: zodResolver(schema), defaultValues: defaults() as DefaultValues<I> });

  const onSubmit = form.handleSubmit(async (parsed) => {
    setFormError(null);
    const values = form.getValues();
    const result = await submit(values, parsed);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, form.setError);
      setFormError(result.error.message);
      return;
    }
    setOpen(false);
    await onSuccess(result.data, parsed, values);
  });

  return {
    form,
    open,
    onOpenChange: (next) => {
      setOpen(next);
      if (next && resetOnOpen) {
        setFormError(null);
        form.reset(defaults());
      }
      if (!next && clearErrorOnClose) setFormError(null);
      if (next) onOpen?.();
    },
    close: () => setOpen(false),
    formError,
    onSubmit,
  };
}

/**
 * The dialog of `useFormDialog`: its trigger, the form with the action's message above the fields,
 * and with `submitLabel` a Cancel and a submit button under them (`submittingLabel`, "Saving…" by
 * default, while it runs; `submitDisabled` holds the submit back, e.g. while an upload runs).
 */
export function FormDialog<I extends FieldValues, O>({
  dialog,
  trigger,
  title,
  description,
  className,
  submitLabel,
  submitVariant,
  submittingLabel = "Saving…",
  submitDisabled,
  children,
}: {
  dialog: FormDialogState<I, O>;
  trigger: ReactNode;
  title: string;
  description?: string;
  className?: string;
  submitLabel?: string;
  submitVariant?: ButtonProps["variant"];
  submittingLabel?: string;
  submitDisabled?: boolean;
  children: ReactNode;
}) {
  const { isSubmitting } = dialog.form.formState;
  return (
    <Dialog open={dialog.open} onOpenChange={dialog.onOpenChange}>
      <DialogTrigger asChild>{trigger}</DialogTrigger>
      <DialogContent title={title} description={description} className={className}>
        <form onSubmit={dialog.onSubmit} noValidate className="space-y-4">
          <FormError message={dialog.formError} />
          <fieldset disabled={isSubmitting} className="space-y-4">
            {children}
            {submitLabel && (
              <div className="flex justify-end gap-2 pt-2">
                <Button variant="secondary" onClick={dialog.close}>
                  Cancel
                </Button>
                <Button type="submit" variant={submitVariant} disabled={submitDisabled}>
                  {isSubmitting ? submittingLabel : submitLabel}
                </Button>
              </div>
            )}
          </fieldset>
        </form>
      </DialogContent>
    </Dialog>
  );
}
