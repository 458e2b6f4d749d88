"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { saveMailPreferencesAction } from "@/app/(clinic)/clinic/settings/actions";
import { type MailKind, type MailPreferences, mailPreferencesSchema } from "@/lib/orders/mail-preferences";

/** Checkboxes for each notification e-mail, saved together. */
export function MailPreferencesForm({
  initial,
  kinds,
  email,
}: {
  initial: MailPreferences;
  kinds: { kind: MailKind; label: string }[];
  email: string;
}) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    reset,
    formState: { isSubmitting, isDirty },
  } = useForm<MailPreferences>({ resolver: zodResolver(mailPreferencesSchema), defaultValues: initial });

  const onSubmit = async (values: MailPreferences) => {
    setFormError(null);
    const result = await saveMailPreferencesAction(values);
    if (!result.ok) {
      setFormError(result.error.message);
      return;
    }
    reset(result.data);
    toast.success("E-mail preferences saved");
    router.refresh();
  };

  return (
    <Card className="max-w-2xl">
      <CardHeader title="E-mails I receive" description={`Sent to ${email}. Untick what you do not want; the pages show everything either way.`} />
      <CardBody>
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="space-y-1">
            <legend className="sr-only">E-mails I receive</legend>
            {kinds.map(({ kind, label }) => (
              <label
                key={kind}
                htmlFor={`mail-${kind}`}
                className="flex min-h-12 cursor-pointer items-center gap-3 rounded-lg px-2 py-2 text-sm text-ink hover:bg-paper focus-within:ring-2 focus-within:ring-lagoon-200"
              >
                <input
                  id={`mail-${kind}`}
                  type="checkbox"
                  className="h-5 w-5 shrink-0 rounded border-line-strong accent-lagoon-700"
                  {...register(kind)}
                />
                <span>{label}</span>
              </label>
            ))}
          </fieldset>
          <div className="flex flex-wrap items-center gap-3 pt-2">
            <Button type="submit" size="lg" disabled={isSubmitting || !isDirty}>
              {isSubmitting ? "Saving…" : "Save preferences"}
            </Button>
            {!isDirty && <span className="text-sm text-muted">No unsaved changes.</span>}
          </div>
        </form>
      </CardBody>
    </Card>
  );
}
