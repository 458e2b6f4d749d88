"use client";

import { CalendarPlus, Copy, Plus, X } from "lucide-react";
import { useState } from "react";
import { useFieldArray, useWatch } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { formatLocalDate } from "@/lib/contracts/format";
import { isLocalDate } from "@/lib/contracts/dates";
import { WEEKDAY_LABELS, WEEKDAYS, type Weekday } from "@/lib/sites/opening-hours";
import { type ContractUseForm, errorAt, idOf, invalidProps } from "./form-helpers";

/** When the turnaround clock runs: working intervals per weekday and the holidays. */
export function ServiceCalendarEditor({ form }: { form: ContractUseForm }) {
  const {
    register,
    formState: { errors },
  } = form;
  return (
    <Card>
      <CardHeader
        title="Service calendar"
        description="The turnaround clock runs only in these hours. Write times as HH:MM; a day that runs to midnight ends at 24:00."
      />
      <CardBody className="space-y-6">
        <Field id={idOf("serviceCalendar.timeZone")} label="Time zone" hint="IANA name, e.g. Europe/London." error={errorAt(errors, "serviceCalendar.timeZone")} className="max-w-xs">
          <Input id={idOf("serviceCalendar.timeZone")} autoComplete="off" {...invalidProps(errors, "serviceCalendar.timeZone")} {...register("serviceCalendar.timeZone")} />
        </Field>
        <div>
          <h3 className="text-sm font-medium text-ink">Working hours</h3>
          <ul className="mt-2 divide-y divide-line rounded-lg border border-line">
            {WEEKDAYS.map((day) => (
              <DayHours key={day} form={form} day={day} />
            ))}
          </ul>
          {errorAt(errors, "serviceCalendar.hours") && (
            <p role="alert" className="mt-2 text-xs font-medium text-danger-700">
              {errorAt(errors, "serviceCalendar.hours")}
            </p>
          )}
        </div>
        <HolidaysEditor form={form} />
      </CardBody>
    </Card>
  );
}

function DayHours({ form, day }: { form: ContractUseForm; day: Weekday }) {
  const {
    control,
    register,
    getValues,
    formState: { errors },
  } = form;
  const name = `serviceCalendar.hours.${day}` as const;
  const { fields, append, remove, replace } = useFieldArray({ control, name });
  const label = WEEKDAY_LABELS[day];
  return (
    <li className="flex flex-col gap-2 px-3 py-3 sm:flex-row sm:items-start">
      <p className="w-28 shrink-0 pt-2 text-sm font-medium text-ink">{label}</p>
      <div className="flex-1 space-y-2">
        {fields.length === 0 && <p className="pt-2 text-sm text-muted">Closed</p>}
        {fields.map((item, index) => {
          const base = `${name}.${index}`;
          const rowError = errorAt(errors, `${base}.start`) ?? errorAt(errors, `${base}.end`) ?? errorAt(errors, base);
          return (
            <div key={item.id}>
              <div className="flex flex-wrap items-center gap-2">
                <label htmlFor={idOf(`${base}.start`)} className="sr-only">
                  {label}, hours {index + 1}, from
                </label>
                <Input
                  id={idOf(`${base}.start`)}
                  className="w-24 tabular-nums"
                  placeholder="08:00"
                  inputMode="numeric"
                  {...invalidProps(errors, `${base}.start`)}
                  {...register(`${name}.${index}.start`)}
                />
                <span className="text-sm text-muted">to</span>
                <label htmlFor={idOf(`${base}.end`)} className="sr-only">
                  {label}, hours {index + 1}, until
                </label>
                <Input
                  id={idOf(`${base}.end`)}
                  className="w-24 tabular-nums"
                  placeholder="18:00"
                  inputMode="numeric"
                  {...invalidProps(errors, `${base}.end`)}
                  {...register(`${name}.${index}.end`)}
                />
                <Button variant="ghost" size="sm" onClick={() => remove(index)} aria-label={`Remove ${label} hours ${index + 1}`}>
                  <X className="h-4 w-4" aria-hidden="true" />
                </Button>
              </div>
              {rowError && (
                <p role="alert" className="mt-1 text-xs font-medium text-danger-700">
                  {rowError}
                </p>
              )}
            </div>
          );
        })}
      </div>
      <div className="flex flex-wrap gap-2">
        <Button variant="secondary" size="sm" onClick={() => append({ start: "08:00", end: "18:00" })}>
          <Plus className="h-4 w-4" aria-hidden="true" />
          Add hours<span className="sr-only"> on {label}</span>
        </Button>
        {day !== "mon" && (
          <Button
            variant="ghost"
            size="sm"
            onClick={() => replace(getValues("serviceCalendar.hours.mon").map((i) => ({ ...i })))}
            aria-label={`Same hours on ${label} as on Monday`}
          >
            <Copy className="h-4 w-4" aria-hidden="true" />
            As Monday
          </Button>
        )}
      </div>
    </li>
  );
}

function HolidaysEditor({ form }: { form: ContractUseForm }) {
  const {
    control,
    setValue,
    formState: { errors, isSubmitted },
  } = form;
  const holidays = useWatch({ control, name: "serviceCalendar.holidays" }) ?? [];
  const [draft, setDraft] = useState("");
  const [draftError, setDraftError] = useState<string | null>(null);
  const set = (next: string[]) =>
    setValue("serviceCalendar.holidays", next, { shouldDirty: true, shouldValidate: isSubmitted });

  const add = () => {
    if (!isLocalDate(draft)) {
      setDraftError("Choose a date first.");
      return;
    }
    setDraftError(null);
    if (!holidays.includes(draft)) set([...holidays, draft].sort());
    setDraft("");
  };

  return (
    <div>
      <h3 className="text-sm font-medium text-ink">Holidays</h3>
      <p className="text-xs text-muted">Closed all day, whatever the weekday.</p>
      <div className="mt-2 flex flex-wrap items-end gap-2">
        <Field id="contract-holiday-draft" label="Holiday to add" error={draftError ?? undefined}>
          <Input
            id="contract-holiday-draft"
            type="date"
            value={draft}
            onChange={(e) => setDraft(e.target.value)}
            onKeyDown={(e) => {
              if (e.key === "Enter") {
                e.preventDefault();
                add();
              }
            }}
          />
        </Field>
        <Button variant="secondary" onClick={add}>
          <CalendarPlus className="h-4 w-4" aria-hidden="true" />
          Add holiday
        </Button>
      </div>
      {holidays.length === 0 ? (
        <p className="mt-3 text-sm text-muted">No holidays listed.</p>
      ) : (
        <ul className="mt-3 flex flex-wrap gap-2" aria-label="Holidays">
          {holidays.map((day, index) => {
            const message = errorAt(errors, `serviceCalendar.holidays.${index}`);
            return (
              <li key={`${day}-${index}`} className="inline-flex items-center gap-1 rounded-full border border-line-strong bg-paper py-0.5 pl-3 pr-1 text-sm">
                <span className="tabular-nums">{isLocalDate(day) ? formatLocalDate(day, { short: true }) : day}</span>
                {message && <span className="text-xs text-danger-700">({message})</span>}
                <button
                  type="button"
                  className="rounded-full p-1 text-muted hover:bg-line"
                  onClick={() => set(holidays.filter((_, i) => i !== index))}
                  aria-label={`Remove holiday ${isLocalDate(day) ? formatLocalDate(day) : day}`}
                >
                  <X className="h-3.5 w-3.5" aria-hidden="true" />
                </button>
              </li>
            );
          })}
        </ul>
      )}
    </div>
  );
}
