"use client";

import { Plus, X } from "lucide-react";
import { type Control, type FieldErrors, type UseFormRegister, useFieldArray } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/input";
import { WEEKDAY_LABELS, WEEKDAYS, type Weekday } from "@/lib/sites/opening-hours";
import type { SiteFields, SiteInput } from "@/lib/sites/schemas";

/** The first error message anywhere inside a day's errors (the day itself, an interval, a time). */
function firstMessage(error: unknown): string | undefined {
  if (!error || typeof error !== "object") return undefined;
  const own = (error as { message?: unknown }).message;
  if (typeof own === "string" && own) return own;
  for (const value of Object.values(error)) {
    const found = firstMessage(value);
    if (found) return found;
  }
  return undefined;
}

function DayRow({
  day,
  control,
  register,
  errors,
}: {
  day: Weekday;
  control: Control<SiteInput, unknown, SiteFields>;
  register: UseFormRegister<SiteInput>;
  errors: FieldErrors<SiteInput>;
}) {
  const { fields, append, remove } = useFieldArray({ control, name: `openingHours.${day}` });
  const message = firstMessage(errors.openingHours?.[day]);
  return (
    <div className="grid grid-cols-[6.5rem_1fr] items-start gap-2 py-1.5">
      <span className="pt-2 text-sm font-medium">{WEEKDAY_LABELS[day]}</span>
      <div className="space-y-1.5">
        {fields.length === 0 && <p className="pt-2 text-sm text-muted">Closed</p>}
        {fields.map((field, index) => (
          <div key={field.id} className="flex items-center gap-2">
            <Input type="text" inputMode="numeric" placeholder="08:00" aria-label={`${WEEKDAY_LABELS[day]} opens`} className="w-24" {...register(`openingHours.${day}.${index}.start`)} />
            <span aria-hidden="true">–</span>
            <Input type="text" inputMode="numeric" placeholder="18:00" aria-label={`${WEEKDAY_LABELS[day]} closes`} className="w-24" {...register(`openingHours.${day}.${index}.end`)} />
            <Button variant="ghost" size="sm" onClick={() => remove(index)} aria-label={`Remove ${WEEKDAY_LABELS[day]} hours ${index + 1}`}>
              <X className="h-4 w-4" aria-hidden="true" />
            </Button>
          </div>
        ))}
        {fields.length < 4 && (
          <Button variant="ghost" size="sm" onClick={() => append({ start: "08:00", end: "18:00" })}>
            <Plus className="h-4 w-4" aria-hidden="true" /> {fields.length === 0 ? "Open this day" : "Add hours"}
          </Button>
        )}
        {message && (
          <p role="alert" className="text-xs font-medium text-danger-700">
            {message}
          </p>
        )}
      </div>
    </div>
  );
}

/** Opening hours per weekday: intervals of local time; "24:00" closes at midnight. */
export function OpeningHoursEditor(props: {
  control: Control<SiteInput, unknown, SiteFields>;
  register: UseFormRegister<SiteInput>;
  errors: FieldErrors<SiteInput>;
}) {
  return (
    <fieldset className="rounded-lg border border-line px-3 py-2">
      <legend className="px-1 text-sm font-medium">Opening hours</legend>
      <p className="mb-1 text-xs text-muted">Local time. Collections and deliveries are planned inside these hours. Write 24:00 for midnight.</p>
      {WEEKDAYS.map((day) => (
        <DayRow key={day} day={day} {...props} />
      ))}
    </fieldset>
  );
}
