"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { deleteShiftAction, saveShiftAction } from "@/lib/dispatch/actions";
import { minutesToClock, type ShiftFields, type ShiftInput, shiftSchema } from "@/lib/dispatch/schemas";

export interface ShiftRow {
  id: number;
  userId: number;
  driverName: string;
  startMin: number;
  endMin: number;
  breakEarliestMin: number | null;
  breakLatestMin: number | null;
  breakDurationMin: number;
  vanId: number | null;
  vanCode: string | null;
}

const blank = (day: string): ShiftInput => ({ day, userId: "", vanId: "", start: "07:00", end: "15:30", breakEarliest: "11:00", breakLatest: "13:00", breakMinutes: 30 });

function fromRow(day: string, s: ShiftRow): ShiftInput {
  return {
    day,
    userId: String(s.userId),
    vanId: s.vanId === null ? "" : String(s.vanId),
    start: minutesToClock(s.startMin),
    end: minutesToClock(s.endMin),
    breakEarliest: s.breakEarliestMin === null ? "" : minutesToClock(s.breakEarliestMin),
    breakLatest: s.breakLatestMin === null ? "" : minutesToClock(s.breakLatestMin),
    breakMinutes: s.breakDurationMin,
  };
}

/** The drivers' shifts of the day: start, end, break, van; add, change, remove. */
export function ShiftsPanel({
  day,
  shifts,
  drivers,
  vans,
  canEdit,
}: {
  day: string;
  shifts: ShiftRow[];
  drivers: { id: number; name: string }[];
  vans: { id: number; code: string; name: string; active: boolean }[];
  canEdit: boolean;
}) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const [pending, start] = useTransition();
  const {
    register,
    handleSubmit,
    reset,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<ShiftInput, unknown, ShiftFields>({ resolver: zodResolver(shiftSchema), defaultValues: blank(day) });

  const onSubmit = async () => {
    setFormError(null);
    const result = await saveShiftAction(getValues());
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success("Shift saved. Plan the day again to use it.");
    reset(blank(day));
    router.refresh();
  };
  const remove = (s: ShiftRow) =>
    start(async () => {
      const result = await deleteShiftAction({ id: s.id });
      if (!result.ok) toast.error(result.error.message);
      else {
        toast.success(`${s.driverName}'s shift removed.`);
        router.refresh();
      }
    });

  return (
    <div className="space-y-4">
      {shifts.length === 0 ? (
        <p className="text-sm text-muted">No driver has a shift on this day yet.</p>
      ) : (
        <table className="w-full text-sm">
          <thead className="text-left text-xs text-muted">
            <tr>
              <th className="py-1 font-medium">Driver</th>
              <th className="px-2 py-1 font-medium">Van</th>
              <th className="py-1 font-medium">Shift</th>
              <th className="py-1 font-medium">Break</th>
              {canEdit && <th className="py-1 font-medium">
                <span className="sr-only">Actions</span>
              </th>}
            </tr>
          </thead>
          <tbody>
            {shifts.map((s) => (
              <tr key={s.id} className="border-t border-line">
                <td className="py-1.5">{s.driverName}</td>
                <td className="px-2 py-1.5">{s.vanCode ?? <span className="text-warn-700">no van</span>}</td>
                <td className="py-1.5 tabular-nums">
                  {minutesToClock(s.startMin)}–{minutesToClock(s.endMin)}
                </td>
                <td className="py-1.5 tabular-nums">
                  {s.breakDurationMin > 0 && s.breakEarliestMin !== null && s.breakLatestMin !== null
                    ? `${s.breakDurationMin} min, starting ${minutesToClock(s.breakEarliestMin)}–${minutesToClock(s.breakLatestMin)}`
                    : "none"}
                </td>
                {canEdit && (
                  <td className="py-1.5 text-right">
                    <Button size="sm" variant="ghost" onClick={() => reset(fromRow(day, s))} disabled={pending}>
                      Change
                    </Button>
                    <Button size="sm" variant="ghost" onClick={() => remove(s)} disabled={pending} aria-label={`Remove ${s.driverName}'s shift`}>
                      Remove
                    </Button>
                  </td>
                )}
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {canEdit && (
        <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-3 rounded-lg border border-line bg-paper p-3" aria-label="Add or change a shift">
          <FormError message={formError} />
          <fieldset disabled={isSubmitting} className="grid gap-3 sm:grid-cols-2">
            <input type="hidden" {...register("day")} />
            <Field id="shift-driver" label="Driver" error={errors.userId?.message} className="sm:col-span-2">
              <Select id="shift-driver" aria-invalid={!!errors.userId} {...register("userId")}>
                <option value="">Choose…</option>
                {drivers.map((d) => (
                  <option key={d.id} value={d.id}>
                    {d.name}
                  </option>
                ))}
              </Select>
            </Field>
            <Field id="shift-van" label="Van" error={errors.vanId?.message} className="sm:col-span-2">
              <Select id="shift-van" aria-invalid={!!errors.vanId} {...register("vanId")}>
                <option value="">No van yet</option>
                {vans
                  .filter((v) => v.active)
                  .map((v) => (
                    <option key={v.id} value={v.id}>
                      {v.code} — {v.name}
                    </option>
                  ))}
              </Select>
            </Field>
            <Field id="shift-start" label="Starts" error={errors.start?.message}>
              <Input id="shift-start" type="time" aria-invalid={!!errors.start} {...register("start")} />
            </Field>
            <Field id="shift-end" label="Ends" error={errors.end?.message}>
              <Input id="shift-end" type="time" aria-invalid={!!errors.end} {...register("end")} />
            </Field>
            <Field id="shift-break" label="Break (min)" error={errors.breakMinutes?.message}>
              <Input id="shift-break" inputMode="numeric" aria-invalid={!!errors.breakMinutes} {...register("breakMinutes")} />
            </Field>
            <div />
            <Field id="shift-break-from" label="Break starts from" error={errors.breakEarliest?.message}>
              <Input id="shift-break-from" type="time" aria-invalid={!!errors.breakEarliest} {...register("breakEarliest")} />
            </Field>
            <Field id="shift-break-to" label="…and by" error={errors.breakLatest?.message}>
              <Input id="shift-break-to" type="time" aria-invalid={!!errors.breakLatest} {...register("breakLatest")} />
            </Field>
            <div className="flex items-end gap-2 sm:col-span-2">
              <Button type="submit">Save shift</Button>
              <Button type="button" variant="ghost" onClick={() => reset(blank(day))}>
                Clear
              </Button>
            </div>
          </fieldset>
        </form>
      )}
    </div>
  );
}
