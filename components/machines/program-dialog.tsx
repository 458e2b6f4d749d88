"use client";

import { useRouter } from "next/navigation";
import type { ReactNode } from "react";
import { type FieldErrors, type UseFormRegister, type UseFormSetValue, useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import type { MachineKind } from "@/db/schema";
import { CYCLE_121C_15MIN, CYCLE_134C_3MIN, CYCLE_GRAVITY_121C_30MIN, CYCLE_PREVACUUM_132C_4MIN } from "@/lib/cycles/sterilizer";
import { createProgramAction, updateProgramAction } from "@/lib/machines/actions";
import {
  A0_CLASS_OPTIONS,
  type ProgramRequirement,
  REQUIREMENT_KINDS_FOR,
  STEAM_DEFAULTS,
  TIME_TEMP_PRESET,
} from "@/lib/machines/requirements";
import { programFormValues, programSchema } from "@/lib/machines/schemas";

type FormInput = z.input<typeof programSchema>;

export interface ProgramFormSubject {
  id: number;
  code: string;
  name: string;
  active: boolean;
  requirement: ProgramRequirement | null;
}

const KIND_CHOICES: Record<ProgramRequirement["kind"], string> = {
  a0: "An A0 value",
  time_temp: "A temperature held for a time",
  steam: "A steam cycle type",
  set_point: "A set point",
};

/** Steam cycle types to start from, each with where its figures come from. */
const STEAM_PRESETS = [
  { label: "134 °C, 3 min (EN 285)", type: CYCLE_134C_3MIN, airRemoval: "prevacuum" as const },
  { label: "121 °C, 15 min (common practice)", type: CYCLE_121C_15MIN, airRemoval: "prevacuum" as const },
  { label: "Pre-vacuum 132 °C, 4 min (CDC 2008, Table 7)", type: CYCLE_PREVACUUM_132C_4MIN, airRemoval: "prevacuum" as const },
  { label: "Gravity 121 °C, 30 min (CDC 2008, Table 7)", type: CYCLE_GRAVITY_121C_30MIN, airRemoval: "gravity" as const },
];

function defaults(machineId: number, machineKind: MachineKind, program?: ProgramFormSubject): FormInput {
  const values = program
    ? programFormValues(program)
    : programFormValues({ code: "", name: "", active: true, requirement: null });
  const kind = program?.requirement?.kind ?? REQUIREMENT_KINDS_FOR[machineKind][0]!;
  return {
    ...values,
    machineId,
    requirementKind: kind,
    bandWidthK: values.bandWidthK || String(STEAM_DEFAULTS.bandWidthK),
    saturationToleranceK: values.saturationToleranceK || String(STEAM_DEFAULTS.saturationToleranceK),
  };
}

/** Add a program to a machine, or edit one, with what it must achieve. */
export function ProgramDialog({
  trigger,
  machineId,
  machineKind,
  program,
}: {
  trigger: ReactNode;
  machineId: number;
  machineKind: MachineKind;
  program?: ProgramFormSubject;
}) {
  const router = useRouter();
  // The form's own values go to the server, which parses them with the same schema.
  const dialog = useFormDialog({
    schema: programSchema,
    defaults: () => defaults(machineId, machineKind, program),
    resetOnOpen: true,
    submit: (values: FormInput) => (program ? updateProgramAction({ ...values, id: program.id }) : createProgramAction(values)),
    onSuccess: () => {
      toast.success(program ? "Program saved" : "Program added");
      router.refresh();
    },
  });
  const {
    register,
    setValue,
    control,
    formState: { errors },
  } = dialog.form;
  const kind = useWatch({ control, name: "requirementKind" });
  const kinds = REQUIREMENT_KINDS_FOR[machineKind];

  return (
    <FormDialog
      dialog={dialog}
      trigger={trigger}
      title={program ? `Edit program ${program.code}` : "Add a program"}
      className="max-w-xl"
      submitLabel={program ? "Save program" : "Add program"}
    >
      <input type="hidden" {...register("machineId")} />
      <div className="grid gap-4 sm:grid-cols-[9rem_1fr]">
        <Field id="program-code" label="Code" hint="e.g. A0-3000" error={errors.code?.message}>
          <Input id="program-code" autoComplete="off" aria-invalid={!!errors.code} {...register("code")} />
        </Field>
        <Field id="program-name" label="Name" error={errors.name?.message}>
          <Input id="program-name" autoComplete="off" aria-invalid={!!errors.name} {...register("name")} />
        </Field>
      </div>
      {kinds.length > 1 ? (
        <Field id="program-kind" label="The program must achieve" error={errors.requirementKind?.message}>
          <Select id="program-kind" aria-invalid={!!errors.requirementKind} {...register("requirementKind")}>
            {kinds.map((k) => (
              <option key={k} value={k}>
                {KIND_CHOICES[k]}
              </option>
            ))}
          </Select>
        </Field>
      ) : (
        <>
          <input type="hidden" {...register("requirementKind")} />
          {errors.requirementKind?.message && (
            <p role="alert" className="text-xs font-medium text-danger-700">
              {errors.requirementKind.message}
            </p>
          )}
        </>
      )}
      {kind === "a0" && <A0Fields register={register} setValue={setValue} errors={errors} />}
      {kind === "time_temp" && <TimeTempFields register={register} setValue={setValue} errors={errors} />}
      {kind === "steam" && <SteamFields register={register} setValue={setValue} errors={errors} />}
      {kind === "set_point" && (
        <div className="grid gap-4 sm:grid-cols-2">
          <Field id="program-set-temp" label="Temperature, °C (optional)" error={errors.setTempC?.message}>
            <Input id="program-set-temp" inputMode="decimal" aria-invalid={!!errors.setTempC} {...register("setTempC")} />
          </Field>
          <Field id="program-set-minutes" label="Time, minutes (optional)" error={errors.setMinutes?.message}>
            <Input id="program-set-minutes" inputMode="decimal" aria-invalid={!!errors.setMinutes} {...register("setMinutes")} />
          </Field>
        </div>
      )}
      <label className="flex items-center gap-3 text-sm text-ink">
        <input type="checkbox" className="h-5 w-5 accent-lagoon-700" {...register("active")} />
        In use (offered at the stations)
      </label>
      <p className="text-xs text-muted">
        The requirement is what Steamlane checks each record against, as an aid. Set it from the unit&apos;s validated process for this machine and
        program.
      </p>
    </FormDialog>
  );
}

interface FieldsProps {
  register: UseFormRegister<FormInput>;
  setValue: UseFormSetValue<FormInput>;
  errors: FieldErrors<FormInput>;
}

function Presets({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="space-y-1.5">
      <p className="text-xs font-medium text-muted">{label}</p>
      <div className="flex flex-wrap gap-2">{children}</div>
    </div>
  );
}

function A0Fields({ register, setValue, errors }: FieldsProps) {
  return (
    <>
      <Presets label="Requirement classes">
        {A0_CLASS_OPTIONS.map((c) => (
          <Button key={c.minA0} size="sm" variant="secondary" onClick={() => setValue("minA0", String(c.minA0), { shouldValidate: true })} title={c.label}>
            A0 {c.minA0} · {c.source}
          </Button>
        ))}
      </Presets>
      <ul className="space-y-0.5 text-xs text-muted">
        {A0_CLASS_OPTIONS.map((c) => (
          <li key={c.minA0}>
            {c.label} ({c.source})
          </li>
        ))}
      </ul>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="program-min-a0" label="Minimum A0 (s at 80 °C)" error={errors.minA0?.message}>
          <Input id="program-min-a0" inputMode="decimal" aria-invalid={!!errors.minA0} {...register("minA0")} />
        </Field>
        <Field id="program-a0-temp" label="Must also reach, °C (optional)" error={errors.a0MinTempC?.message}>
          <Input id="program-a0-temp" inputMode="decimal" aria-invalid={!!errors.a0MinTempC} {...register("a0MinTempC")} />
        </Field>
      </div>
    </>
  );
}

function TimeTempFields({ register, setValue, errors }: FieldsProps) {
  return (
    <>
      <Presets label="Starting point">
        <Button
          size="sm"
          variant="secondary"
          onClick={() => {
            setValue("minTempC", String(TIME_TEMP_PRESET.minTempC), { shouldValidate: true });
            setValue("holdMinutes", String(TIME_TEMP_PRESET.minHoldSeconds / 60), { shouldValidate: true });
          }}
        >
          {TIME_TEMP_PRESET.label}
        </Button>
      </Presets>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="program-min-temp" label="Temperature, °C" error={errors.minTempC?.message}>
          <Input id="program-min-temp" inputMode="decimal" aria-invalid={!!errors.minTempC} {...register("minTempC")} />
        </Field>
        <Field id="program-hold" label="Held for at least, minutes" error={errors.holdMinutes?.message}>
          <Input id="program-hold" inputMode="decimal" aria-invalid={!!errors.holdMinutes} {...register("holdMinutes")} />
        </Field>
      </div>
    </>
  );
}

function SteamFields({ register, setValue, errors }: FieldsProps) {
  return (
    <>
      <Presets label="Cycle types">
        {STEAM_PRESETS.map((p) => (
          <Button
            key={p.label}
            size="sm"
            variant="secondary"
            onClick={() => {
              setValue("cycleName", p.type.name);
              setValue("sterilisationTempC", String(p.type.sterilisationTempC));
              setValue("bandWidthK", String(p.type.bandWidthK ?? STEAM_DEFAULTS.bandWidthK));
              setValue("saturationToleranceK", String(p.type.saturationToleranceK ?? STEAM_DEFAULTS.saturationToleranceK));
              setValue("holdMinutes", String(p.type.minHoldSeconds / 60));
              setValue("airRemoval", p.airRemoval);
            }}
          >
            {p.label}
          </Button>
        ))}
      </Presets>
      <Field id="program-cycle-name" label="Cycle type name" error={errors.cycleName?.message}>
        <Input id="program-cycle-name" autoComplete="off" aria-invalid={!!errors.cycleName} {...register("cycleName")} />
      </Field>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="program-steri-temp" label="Sterilisation temperature, °C" error={errors.sterilisationTempC?.message}>
          <Input id="program-steri-temp" inputMode="decimal" aria-invalid={!!errors.sterilisationTempC} {...register("sterilisationTempC")} />
        </Field>
        <Field id="program-band" label="Band above it, K" hint="3 K (EN 285, from memory)" error={errors.bandWidthK?.message}>
          <Input id="program-band" inputMode="decimal" aria-invalid={!!errors.bandWidthK} {...register("bandWidthK")} />
        </Field>
        <Field id="program-steri-hold" label="Holding time, minutes" error={errors.holdMinutes?.message}>
          <Input id="program-steri-hold" inputMode="decimal" aria-invalid={!!errors.holdMinutes} {...register("holdMinutes")} />
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="program-air" label="Air removal" error={errors.airRemoval?.message}>
          <Select id="program-air" {...register("airRemoval")}>
            <option value="prevacuum">Pre-vacuum</option>
            <option value="gravity">Gravity</option>
          </Select>
        </Field>
        <Field id="program-sat" label="Steam tolerance, K" hint="2 K (EN 285, from memory)" error={errors.saturationToleranceK?.message}>
          <Input id="program-sat" inputMode="decimal" aria-invalid={!!errors.saturationToleranceK} {...register("saturationToleranceK")} />
        </Field>
        <Field id="program-f0" label="Minimum F0, min (optional)" error={errors.minF0?.message}>
          <Input id="program-f0" inputMode="decimal" aria-invalid={!!errors.minF0} {...register("minF0")} />
        </Field>
      </div>
    </>
  );
}
