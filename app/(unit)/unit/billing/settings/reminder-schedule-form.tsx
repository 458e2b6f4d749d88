"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { Plus, Trash2 } from "lucide-react";
import { useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { toast } from "sonner";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/input";
import { saveReminderScheduleAction } from "./actions";
import { type ReminderSchedule, type ReminderScheduleInput, reminderScheduleSchema } from "./schemas";

/** The days after the due date on which an unpaid invoice's reminder goes to the customer. */
export function ReminderScheduleForm({ initial, editable }: { initial: number[]; editable: boolean }) {
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    control,
    handleSubmit,
    reset,
    formState: { errors, isSubmitting, isDirty },
  } = useForm<ReminderScheduleInput, unknown, ReminderSchedule>({
    resolver: zodResolver(reminderScheduleSchema),
    defaultValues: { days: initial.map((value) => ({ value })) },
  });
  const { fields, append, remove } = useFieldArray({ control, name: "days" });

  const onSubmit = async (values: ReminderSchedule) => {
    setFormError(null);
    const result = await saveReminderScheduleAction(values);
    if (!result.ok) {
      setFormError(Object.values(result.error.fields ?? {})[0]?.[0] ?? result.error.message);
      return;
    }
    toast.success(result.data.days.length === 0 ? "No reminders will be sent." : `Reminders on days ${result.data.days.join(", ")} after the due date.`);
    reset({ days: result.data.days.map((value) => ({ value })) });
  };

  const listError = errors.days?.root?.message ?? errors.days?.message;
  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
      <FormError message={formError ?? listError} />
      <fieldset disabled={!editable || isSubmitting} className="space-y-3">
        <legend className="sr-only">Reminder days</legend>
        {fields.length === 0 && <p className="text-sm text-muted">No reminders are sent.</p>}
        <ul className="space-y-2">
          {fields.map((field, index) => (
            <li key={field.id} className="flex items-start gap-2">
              <div className="w-32">
                <label htmlFor={`reminder-${index}`} className="sr-only">
                  Reminder {index + 1}: days after the due date
                </label>
                <Input
                  id={`reminder-${index}`}
                  type="number"
                  min={1}
                  max={365}
                  inputMode="numeric"
                  aria-invalid={!!errors.days?.[index]?.value}
                  aria-describedby={errors.days?.[index]?.value ? `reminder-${index}-error` : undefined}
                  {...register(`days.${index}.value`)}
                />
                {errors.days?.[index]?.value && (
                  <p id={`reminder-${index}-error`} role="alert" className="mt-1 text-xs font-medium text-danger-700">
                    {errors.days[index]?.value?.message}
                  </p>
                )}
              </div>
              <span className="pt-2 text-sm text-muted">days after the due date</span>
              {editable && (
                <Button variant="ghost" size="sm" className="mt-1" onClick={() => remove(index)} aria-label={`Remove reminder ${index + 1}`}>
                  <Trash2 className="h-4 w-4" aria-hidden="true" />
                </Button>
              )}
            </li>
          ))}
        </ul>
        {editable && (
          <div className="flex flex-wrap gap-2">
            <Button variant="secondary" size="sm" onClick={() => append({ value: "" as unknown as number })} disabled={fields.length >= 10}>
              <Plus className="h-4 w-4" aria-hidden="true" /> Add a reminder
            </Button>
            <Button type="submit" size="sm" disabled={!isDirty}>
              {isSubmitting ? "Saving…" : "Save schedule"}
            </Button>
          </div>
        )}
      </fieldset>
    </form>
  );
}
