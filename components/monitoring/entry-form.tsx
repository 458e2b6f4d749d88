"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { type Resolver, useForm, useWatch } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import type { MachineKind } from "@/db/schema";
import { toLocalDateTimeText } from "@/lib/local-time";
import { recordEntryAction } from "@/lib/monitoring/actions";
import { ENTRY_KIND_LABELS, type EntryInput, entrySchema, type EntryKind } from "@/lib/monitoring/schemas";

// One form for every kind of log entry: choosing the kind shows that kind's fields; the same zod
// schema (a union by kind) checks it here and again on the server.

export interface MachineChoice {
  id: number;
  code: string;
  name: string;
  kind: MachineKind;
  outOfUse: boolean;
}

/** Every field any kind of entry has, as typed. */
interface FormValues {
  kind: EntryKind;
  machineId: string;
  at: string;
  notes: string;
  provider: string;
  reference: string;
  outcome: "" | "pass" | "fail";
  conductivityUsCm: string;
  hardness: string;
  hardnessUnit: "mmol_l" | "dh";
  saltKg: string;
  place: string;
  temperatureC: string;
  humidityPct: string;
}

const MACHINES_FOR: Partial<Record<EntryKind, MachineKind[] | "any">> = {
  washer_cleaning: ["washer"],
  seal_test: ["heat_sealer"],
  service: "any",
  fault: "any",
};

function blank(kind: EntryKind, timeZone: string, machineId = ""): FormValues {
  return {
    kind,
    machineId,
    at: toLocalDateTimeText(new Date(), timeZone),
    notes: "",
    provider: "",
    reference: "",
    outcome: "",
    conductivityUsCm: "",
    hardness: "",
    hardnessUnit: "mmol_l",
    saltKg: "",
    place: "Sterile store",
    temperatureC: "",
    humidityPct: "",
  };
}

/** The form to record an entry; `kinds` are those the caller may record. */
export function EntryForm({ kinds, machines, timeZone }: { kinds: EntryKind[]; machines: MachineChoice[]; timeZone: string }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    control,
    reset,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<FormValues>({
    // The union schema checks whichever kind is chosen; the fields of other kinds are ignored.
    resolver: zodResolver(entrySchema) as unknown as Resolver<FormValues>,
    defaultValues: blank(kinds[0] ?? "store_climate", timeZone),
  });
  const kind = useWatch({ control, name: "kind" });
  const wanted = MACHINES_FOR[kind];
  const choices = wanted ? machines.filter((m) => wanted === "any" || wanted.includes(m.kind)) : [];
  const err = (name: keyof FormValues) => errors[name]?.message;

  const onSubmit = async () => {
    setFormError(null);
    const values = getValues();
    const result = await recordEntryAction(values as unknown as EntryInput);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    if (result.data.outOfRange) {
      toast.warning(`Recorded, out of range: ${result.data.findings.join(" ")}`);
    } else {
      toast.success(`${ENTRY_KIND_LABELS[values.kind]} recorded`);
    }
    reset(blank(values.kind, timeZone, values.kind === "seal_test" || values.kind === "washer_cleaning" ? "" : values.machineId));
    router.refresh();
  };

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4" data-testid="entry-form">
      <FormError message={formError} />
      <fieldset disabled={isSubmitting} className="space-y-4">
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id="entry-kind" label="Entry" error={err("kind")}>
            <Select
              id="entry-kind"
              {...register("kind", {
                onChange: (e: { target: { value: EntryKind } }) => {
                  setFormError(null);
                  reset({ ...blank(e.target.value, timeZone), at: getValues("at") });
                },
              })}
            >
              {kinds.map((k) => (
                <option key={k} value={k}>
                  {ENTRY_KIND_LABELS[k]}
                </option>
              ))}
            </Select>
          </Field>
          <Field id="entry-at" label="Done at (unit time)" error={err("at")}>
            <Input id="entry-at" type="datetime-local" aria-invalid={!!errors.at} {...register("at")} />
          </Field>
        </div>

        {wanted && (
          <Field id="entry-machine" label="Machine" error={err("machineId")}>
            <Select id="entry-machine" aria-invalid={!!errors.machineId} {...register("machineId")}>
              <option value="">Choose…</option>
              {choices.map((m) => (
                <option key={m.id} value={m.id}>
                  {m.code} · {m.name}
                  {m.outOfUse ? " (out of use)" : ""}
                </option>
              ))}
            </Select>
          </Field>
        )}

        {kind === "seal_test" && (
          <fieldset className="space-y-1.5">
            <legend className="text-sm font-medium text-ink">Result of the seal test</legend>
            <div className="flex gap-6 text-sm">
              <label className="flex items-center gap-2">
                <input type="radio" value="pass" className="h-4 w-4 accent-lagoon-700" {...register("outcome")} /> Passed: seal complete, even and unbroken
              </label>
              <label className="flex items-center gap-2">
                <input type="radio" value="fail" className="h-4 w-4 accent-lagoon-700" {...register("outcome")} /> Failed
              </label>
            </div>
            {errors.outcome && (
              <p role="alert" className="text-xs font-medium text-danger-700">
                {errors.outcome.message}
              </p>
            )}
          </fieldset>
        )}

        {kind === "store_climate" && (
          <div className="grid gap-4 sm:grid-cols-3">
            <Field id="entry-place" label="Store" error={err("place")}>
              <Input id="entry-place" aria-invalid={!!errors.place} {...register("place")} />
            </Field>
            <Field id="entry-temperature" label="Temperature, °C" error={err("temperatureC")}>
              <Input id="entry-temperature" inputMode="decimal" aria-invalid={!!errors.temperatureC} {...register("temperatureC")} />
            </Field>
            <Field id="entry-humidity" label="Relative humidity, %" error={err("humidityPct")}>
              <Input id="entry-humidity" inputMode="decimal" aria-invalid={!!errors.humidityPct} {...register("humidityPct")} />
            </Field>
          </div>
        )}

        {kind === "water_reading" && (
          <div className="grid gap-4 sm:grid-cols-[1fr_1fr_8rem]">
            <Field id="entry-conductivity" label="Final-rinse conductivity, µS/cm" error={err("conductivityUsCm")}>
              <Input id="entry-conductivity" inputMode="decimal" aria-invalid={!!errors.conductivityUsCm} {...register("conductivityUsCm")} />
            </Field>
            <Field id="entry-hardness" label="Hardness after softening" error={err("hardness")}>
              <Input id="entry-hardness" inputMode="decimal" aria-invalid={!!errors.hardness} {...register("hardness")} />
            </Field>
            <Field id="entry-hardness-unit" label="Unit" error={err("hardnessUnit")}>
              <Select id="entry-hardness-unit" {...register("hardnessUnit")}>
                <option value="mmol_l">mmol/l</option>
                <option value="dh">°dH</option>
              </Select>
            </Field>
          </div>
        )}

        {kind === "salt_refill" && (
          <Field id="entry-salt" label="Salt added, kg" error={err("saltKg")} className="sm:w-1/2">
            <Input id="entry-salt" inputMode="decimal" aria-invalid={!!errors.saltKg} {...register("saltKg")} />
          </Field>
        )}

        {kind === "service" && (
          <div className="grid gap-4 sm:grid-cols-2">
            <Field id="entry-provider" label="Done by (company or engineer)" error={err("provider")}>
              <Input id="entry-provider" aria-invalid={!!errors.provider} {...register("provider")} />
            </Field>
            <Field id="entry-reference" label="Report or job reference (optional)" error={err("reference")}>
              <Input id="entry-reference" aria-invalid={!!errors.reference} {...register("reference")} />
            </Field>
          </div>
        )}

        {kind === "fault" && (
          <p className="rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-2 text-sm text-danger-700">
            Recording a fault takes the machine out of use until the quality lead clears it.
          </p>
        )}

        <Field
          id="entry-notes"
          label={kind === "service" ? "What was done" : kind === "fault" ? "What happened" : "Notes (optional)"}
          error={err("notes")}
        >
          <Textarea id="entry-notes" rows={kind === "service" || kind === "fault" ? 3 : 2} aria-invalid={!!errors.notes} {...register("notes")} />
        </Field>

        <div className="flex justify-end">
          <Button type="submit">{isSubmitting ? "Recording…" : "Record entry"}</Button>
        </div>
      </fieldset>
    </form>
  );
}
