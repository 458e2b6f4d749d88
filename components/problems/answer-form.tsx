"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { useForm, useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import { answerProblemAction } from "@/lib/problems/actions";
import { ANSWER_MAX, answerProblemSchema } from "@/lib/problems/schemas";

type FormInput = z.input<typeof answerProblemSchema>;
type FormOutput = z.output<typeof answerProblemSchema>;

/** The unit's written answer to a problem; it is final and e-mailed to the clinic. */
export function AnswerForm({ problemId, siteName }: { problemId: number; siteName: string }) {
  const router = useRouter();
  const uid = useId();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormInput, unknown, FormOutput>({ resolver: zodResolver(answerProblemSchema), defaultValues: { problemId, answer: "" } });
  const answer = useWatch({ control, name: "answer" }) ?? "";

  const onSubmit = async (values: FormOutput) => {
    setFormError(null);
    const result = await answerProblemAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    const n = result.data.notified;
    toast.success(n === 0 ? "Answer saved; nobody at the clinic receives these e-mails" : `Answer sent to ${n} ${n === 1 ? "person" : "people"} at ${siteName}`);
    router.refresh();
  };

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <FormError message={formError} />
      <fieldset disabled={isSubmitting} className="space-y-4">
        <input type="hidden" {...register("problemId")} />
        <Field
          id={`${uid}-answer`}
          label="Your answer to the clinic"
          hint={`What you found, what happens to the set, and what the clinic should do now. Sent as written; it cannot be changed afterwards. ${answer.length}/${ANSWER_MAX}`}
          error={errors.answer?.message}
        >
          <Textarea id={`${uid}-answer`} rows={6} maxLength={ANSWER_MAX + 200} aria-invalid={!!errors.answer} {...register("answer")} />
        </Field>
        <div className="flex justify-end">
          <Button type="submit">{isSubmitting ? "Sending…" : "Send the answer"}</Button>
        </div>
      </fieldset>
    </form>
  );
}
