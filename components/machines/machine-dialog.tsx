"use client";

import { useRouter } from "next/navigation";
import type { ReactNode } from "react";
import { toast } from "sonner";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import type { MachineKind } from "@/db/schema";
import { createMachineAction, updateMachineAction } from "@/lib/machines/actions";
import { MACHINE_KIND_LABELS, MACHINE_KINDS } from "@/lib/machines/requirements";
import { type MachineFields, type MachineInput, machineSchema } from "@/lib/machines/schemas";

export interface MachineFormSubject {
  id: number;
  kind: MachineKind;
  code: string;
  name: string;
  serialNumber: string | null;
  capacityStu: number | null;
  chamber?: { widthMm: number; heightMm: number; depthMm: number } | null;
  active: boolean;
  programCount: number;
}

function defaults(machine?: MachineFormSubject): MachineInput {
  return {
    kind: machine?.kind ?? "washer",
    code: machine?.code ?? "",
    name: machine?.name ?? "",
    serialNumber: machine?.serialNumber ?? "",
    capacityStu: machine?.capacityStu === null || machine?.capacityStu === undefined ? "" : String(machine.capacityStu),
    active: machine?.active ?? true,
    chamberWidthMm: machine?.chamber ? String(machine.chamber.widthMm) : "",
    chamberHeightMm: machine?.chamber ? String(machine.chamber.heightMm) : "",
    chamberDepthMm: machine?.chamber ? String(machine.chamber.depthMm) : "",
  };
}

/** Add a machine, or edit one. */
export function MachineDialog({ trigger, machine }: { trigger: ReactNode; machine?: MachineFormSubject }) {
  const router = useRouter();
  // The form's own values go to the server, which parses them again with the same schema.
  const dialog = useFormDialog({
    schema: machineSchema,
    defaults: () => defaults(machine),
    resetOnOpen: true,
    submit: (values: MachineInput) => (machine ? updateMachineAction({ ...values, id: machine.id }) : createMachineAction(values)),
    onSuccess: (data, parsed: MachineFields) => {
      toast.success(machine ? `${parsed.code} saved` : `${parsed.code} added`);
      if (machine) router.refresh();
      else {
        dialog.form.reset(defaults());
        router.push(`/unit/machines/${data.id}`);
      }
    },
  });
  const {
    register,
    formState: { errors },
  } = dialog.form;

  return (
    <FormDialog dialog={dialog} trigger={trigger} title={machine ? `Edit ${machine.code}` : "Add a machine"} submitLabel={machine ? "Save machine" : "Add machine"}>
      {machine && machine.programCount > 0 ? (
        <div className="space-y-1.5">
          <p className="text-sm font-medium text-ink">Kind</p>
          <p className="text-sm text-ink-soft">{MACHINE_KIND_LABELS[machine.kind]} — a machine with programs keeps its kind.</p>
          <input type="hidden" {...register("kind")} />
        </div>
      ) : (
        <Field id="machine-kind" label="Kind" error={errors.kind?.message}>
          <Select id="machine-kind" aria-invalid={!!errors.kind} {...register("kind")}>
            {MACHINE_KINDS.map((k) => (
              <option key={k} value={k}>
                {MACHINE_KIND_LABELS[k]}
              </option>
            ))}
          </Select>
        </Field>
      )}
      <div className="grid gap-4 sm:grid-cols-[8rem_1fr]">
        <Field id="machine-code" label="Code" hint="Printed on the machine, e.g. W3" error={errors.code?.message}>
          <Input id="machine-code" autoComplete="off" aria-invalid={!!errors.code} {...register("code")} />
        </Field>
        <Field id="machine-name" label="Name" error={errors.name?.message}>
          <Input id="machine-name" autoComplete="off" aria-invalid={!!errors.name} {...register("name")} />
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="machine-serial" label="Serial number (optional)" error={errors.serialNumber?.message}>
          <Input id="machine-serial" autoComplete="off" aria-invalid={!!errors.serialNumber} {...register("serialNumber")} />
        </Field>
        <Field id="machine-capacity" label="Capacity in StU (optional)" hint="Sterilisation units of 300 × 300 × 600 mm" error={errors.capacityStu?.message}>
          <Input id="machine-capacity" inputMode="decimal" aria-invalid={!!errors.capacityStu} {...register("capacityStu")} />
        </Field>
      </div>
      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink">Inner chamber in mm (optional)</legend>
        <div className="grid gap-4 sm:grid-cols-3">
          <Field id="machine-chamber-width" label="Width" error={errors.chamberWidthMm?.message}>
            <Input id="machine-chamber-width" inputMode="numeric" aria-invalid={!!errors.chamberWidthMm} {...register("chamberWidthMm")} />
          </Field>
          <Field id="machine-chamber-height" label="Height" error={errors.chamberHeightMm?.message}>
            <Input id="machine-chamber-height" inputMode="numeric" aria-invalid={!!errors.chamberHeightMm} {...register("chamberHeightMm")} />
          </Field>
          <Field id="machine-chamber-depth" label="Depth" error={errors.chamberDepthMm?.message}>
            <Input id="machine-chamber-depth" inputMode="numeric" aria-invalid={!!errors.chamberDepthMm} {...register("chamberDepthMm")} />
          </Field>
        </div>
        <p className="text-xs text-muted">With the chamber given, an empty capacity is worked out as the whole StU modules that fit.</p>
      </fieldset>
      <label className="flex items-center gap-3 text-sm text-ink">
        <input type="checkbox" className="h-5 w-5 accent-lagoon-700" {...register("active")} />
        In use (switched off machines cannot take new batches or loads)
      </label>
    </FormDialog>
  );
}
