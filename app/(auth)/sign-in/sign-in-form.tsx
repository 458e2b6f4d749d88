"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { signIn } from "next-auth/react";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";

const schema = z.object({
  email: z.string().trim().min(1, "Enter your e-mail address.").max(254),
  password: z.string().min(1, "Enter your password.").max(200),
});
type Values = z.infer<typeof schema>;

export function SignInForm() {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(schema) });

  const onSubmit = async (values: Values) => {
    setError(null);
    const result = await signIn("credentials", { ...values, redirect: false });
    if (!result || result.error) {
      setError(result?.error && result.error !== "CredentialsSignin" ? result.error : "Wrong e-mail or password.");
      return;
    }
    // The root page sends each role to its own home.
    router.replace("/");
  };

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <FormError message={error} />
      <fieldset disabled={isSubmitting} className="space-y-4">
        <Field id="email" label="E-mail" error={errors.email?.message}>
          <Input id="email" type="email" autoComplete="username" aria-invalid={!!errors.email} {...register("email")} />
        </Field>
        <Field id="password" label="Password" error={errors.password?.message}>
          <Input
            id="password"
            type="password"
            autoComplete="current-password"
            aria-invalid={!!errors.password}
            {...register("password")}
          />
        </Field>
        <Button type="submit" className="w-full" size="lg">
          {isSubmitting ? "Signing in…" : "Sign in"}
        </Button>
      </fieldset>
    </form>
  );
}
