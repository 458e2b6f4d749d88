"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { signIn } from "next-auth/react";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { PASSWORD_MIN_LENGTH } from "@/lib/auth/password-rules";
import { type AcceptInvitationInput, acceptInvitationSchema } from "@/lib/users/schemas";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { acceptInvitationAction } from "../actions";

export function AcceptInviteForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError: setFieldError,
    formState: { errors, isSubmitting },
  } = useForm<AcceptInvitationInput>({
    resolver: zodResolver(acceptInvitationSchema),
    defaultValues: { token, password: "", confirm: "" },
  });

  const onSubmit = async (values: AcceptInvitationInput) => {
    setError(null);
    const result = await acceptInvitationAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setFieldError);
      setError(result.error.message);
      return;
    }
    const signedIn = await signIn("credentials", { email, password: values.password, redirect: false });
    router.replace(signedIn?.ok ? "/" : "/sign-in");
  };

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <FormError message={error} />
      <input type="hidden" {...register("token")} />
      <fieldset disabled={isSubmitting} className="space-y-4">
        <Field
          id="password"
          label="New password"
          hint={`At least ${PASSWORD_MIN_LENGTH} characters. A short sentence works well.`}
          error={errors.password?.message}
        >
          <Input id="password" type="password" autoComplete="new-password" aria-invalid={!!errors.password} {...register("password")} />
        </Field>
        <Field id="confirm" label="Repeat the password" error={errors.confirm?.message}>
          <Input id="confirm" type="password" autoComplete="new-password" aria-invalid={!!errors.confirm} {...register("confirm")} />
        </Field>
        <Button type="submit" size="lg" className="w-full">
          {isSubmitting ? "Saving…" : "Save password and sign in"}
        </Button>
      </fieldset>
    </form>
  );
}
