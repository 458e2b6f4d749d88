"use client";

import { useQueryClient } from "@tanstack/react-query";
import { ArrowDown, ArrowUp, FileText, Pencil, Plus, Trash2, Upload } from "lucide-react";
import { useRouter } from "next/navigation";
import { useId, useState } from "react";
import { Controller, useFieldArray, useWatch } from "react-hook-form";
import { toast } from "sonner";
import type { z } from "zod";
import { FormDialog, useFormDialog } from "@/components/forms/form-dialog";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import { fetchJson } from "@/lib/fetch-json";
import { createSetTypeAction, updateSetTypeAction } from "@/lib/catalogue/actions";
import { MAX_SIZE_STU } from "@/lib/catalogue/measures";
import { setTypeFieldsSchema } from "@/lib/catalogue/schemas";
import {
  expectsIfu,
  PACKAGING_LABELS,
  PACKAGINGS,
  PROCESSING_FLAG_LABELS,
  PROCESSING_FLAGS,
  SET_CLASS_LABELS,
  SET_CLASSES,
  STERILISATION_METHOD_LABELS,
  STERILISATION_METHODS,
} from "@/lib/catalogue/vocabulary";

type FormInput = z.input<typeof setTypeFieldsSchema>;

export interface SetTypeFormDefaults extends Omit<FormInput, "ifuFileId"> {
  ifu: { id: number; name: string } | null;
}

const EMPTY: SetTypeFormDefaults = {
  code: "",
  name: "",
  setClass: "basic_tray",
  packaging: "wrap",
  sterilisationMethod: "steam_134",
  flags: [],
  processingNotes: "",
  weightKg: "",
  sizeStu: "",
  items: [{ name: "", quantity: "1" }],
  ifu: null,
};

type Target = { mode: "create"; organisationId: number } | { mode: "edit"; organisationId: number; setTypeId: number };

/** Create or edit a set type: its fields, processing flags, IFU and the ordered contents list. */
export function SetTypeFormDialog({
  target,
  organisationName,
  defaults = EMPTY,
  basePath,
}: {
  target: Target;
  organisationName: string;
  defaults?: SetTypeFormDefaults;
  basePath: string;
}) {
  const [ifu, setIfu] = useState(defaults.ifu);
  const [uploading, setUploading] = useState(false);
  const [uploadError, setUploadError] = useState<string | null>(null);
  const queryClient = useQueryClient();
  const router = useRouter();
  const uid = useId();
  const { ifu: _ifu, ...initial } = defaults;
  const dialog = useFormDialog({
    schema: setTypeFieldsSchema,
    defaults: (): FormInput => ({ ...initial, ifuFileId: defaults.ifu?.id ?? null }),
    resetOnOpen: true,
    onOpen: () => {
      setIfu(defaults.ifu);
      setUploadError(null);
    },
    // The actions parse the form's own values with the same schema.
    submit: (values) =>
      target.mode === "create"
        ? createSetTypeAction({ ...values, organisationId: target.organisationId })
        : updateSetTypeAction({ ...values, setTypeId: target.setTypeId }),
    onSuccess: async (data: { id: number; changes?: string[] }, _parsed, values) => {
      await queryClient.invalidateQueries({ queryKey: ["set-types"] });
      if (target.mode === "create") {
        toast.success(`${values.name} added to the catalogue`);
        router.push(`${basePath}/${data.id}`);
      } else {
        const changes = data.changes ?? [];
        toast.success(changes.length ? `Saved: ${changes.join("; ")}` : "Nothing changed");
        router.refresh();
      }
    },
  });
  const {
    register,
    control,
    setValue,
    formState: { errors, isSubmitting },
  } = dialog.form;
  const items = useFieldArray({ control, name: "items" });
  const setClass = useWatch({ control, name: "setClass" });
  const ifuFileId = useWatch({ control, name: "ifuFileId" });

  const uploadIfu = async (file: File | undefined) => {
    if (!file) return;
    setUploadError(null);
    setUploading(true);
    try {
      const body = new FormData();
      body.set("file", file);
      body.set("purpose", "ifu");
      body.set("organisationId", String(target.organisationId));
      const saved = await fetchJson<{ id: number; name: string }>("/api/files", { method: "POST", body });
      setValue("ifuFileId", saved.id, { shouldDirty: true });
      setIfu({ id: saved.id, name: saved.name });
    } catch (error) {
      setUploadError(error instanceof Error ? error.message : "The upload did not work.");
    } finally {
      setUploading(false);
    }
  };

  const id = (name: string) => `${uid}-${name}`;
  const itemsError = errors.items?.message ?? errors.items?.root?.message;

  return (
    <FormDialog
      dialog={dialog}
      trigger={
        target.mode === "create" ? (
          <Button>
            <Plus className="h-4 w-4" aria-hidden="true" />
            New set type
          </Button>
        ) : (
          <Button variant="secondary">
            <Pencil className="h-4 w-4" aria-hidden="true" />
            Edit
          </Button>
        )
      }
      title={target.mode === "create" ? "New set type" : "Edit set type"}
      description={`In the catalogue of ${organisationName}.`}
      className="max-w-3xl"
    >
      <div className="grid gap-4 sm:grid-cols-[12rem_1fr]">
        <Field id={id("code")} label="Code" hint="Capitals, digits and hyphens, e.g. ORTH-MAJ-01." error={errors.code?.message}>
          <Input id={id("code")} autoComplete="off" className="font-mono uppercase" aria-invalid={!!errors.code} {...register("code")} />
        </Field>
        <Field id={id("name")} label="Name" error={errors.name?.message}>
          <Input id={id("name")} autoComplete="off" aria-invalid={!!errors.name} {...register("name")} />
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id={id("class")} label="Set class" error={errors.setClass?.message}>
          <Select id={id("class")} {...register("setClass")}>
            {SET_CLASSES.map((c) => (
              <option key={c} value={c}>
                {SET_CLASS_LABELS[c]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id={id("packaging")} label="Packaging" error={errors.packaging?.message}>
          <Select id={id("packaging")} {...register("packaging")}>
            {PACKAGINGS.map((p) => (
              <option key={p} value={p}>
                {PACKAGING_LABELS[p]}
              </option>
            ))}
          </Select>
        </Field>
        <Field id={id("method")} label="Sterilisation method" error={errors.sterilisationMethod?.message}>
          <Select id={id("method")} {...register("sterilisationMethod")}>
            {STERILISATION_METHODS.map((m) => (
              <option key={m} value={m}>
                {STERILISATION_METHOD_LABELS[m]}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id={id("weight")} label="Weight (kg)" hint="Packed, up to 2 decimals, e.g. 4.25." error={errors.weightKg?.message}>
          <Input id={id("weight")} inputMode="decimal" autoComplete="off" aria-invalid={!!errors.weightKg} {...register("weightKg")} />
        </Field>
        <Field
          id={id("size")}
          label="Size (StU)"
          hint={`Sterilisation units (1 StU = 300 × 300 × 600 mm): 0.25, 0.5, 1, 2 … at most ${MAX_SIZE_STU}.`}
          error={errors.sizeStu?.message}
        >
          <Input id={id("size")} inputMode="decimal" autoComplete="off" aria-invalid={!!errors.sizeStu} {...register("sizeStu")} />
        </Field>
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink">Processing</legend>
        <Controller
          control={control}
          name="flags"
          render={({ field }) => {
            const selected = field.value ?? [];
            return (
              <div className="grid gap-2 sm:grid-cols-2">
                {PROCESSING_FLAGS.map((flag) => (
                  <label key={flag} className="flex items-center gap-2 text-sm text-ink">
                    <input
                      type="checkbox"
                      className="h-4 w-4 rounded border-line-strong text-lagoon-700 focus:ring-2 focus:ring-lagoon-200"
                      checked={selected.includes(flag)}
                      onChange={(e) => field.onChange(e.target.checked ? [...selected, flag] : selected.filter((f) => f !== flag))}
                    />
                    {PROCESSING_FLAG_LABELS[flag]}
                  </label>
                ))}
              </div>
            );
          }}
        />
      </fieldset>
      <Field id={id("notes")} label="Processing notes (optional)" error={errors.processingNotes?.message}>
        <Textarea id={id("notes")} rows={3} {...register("processingNotes")} />
      </Field>

      <div className="space-y-2">
        <p className="text-sm font-medium text-ink">Instructions for use (PDF)</p>
        {ifu && ifuFileId ? (
          <div className="flex flex-wrap items-center gap-3 rounded-lg border border-line px-3 py-2 text-sm">
            <FileText className="h-4 w-4 text-muted" aria-hidden="true" />
            <a href={`/api/files/${ifu.id}`} target="_blank" rel="noreferrer" className="font-medium text-lagoon-800 underline">
              {ifu.name}
            </a>
            <Button
              variant="ghost"
              size="sm"
              onClick={() => {
                setValue("ifuFileId", null, { shouldDirty: true });
                setIfu(null);
              }}
            >
              Remove
            </Button>
          </div>
        ) : null}
        <label htmlFor={id("ifu")} className="inline-flex cursor-pointer items-center gap-2 rounded-lg border border-line-strong px-3 py-2 text-sm font-medium text-ink focus-within:ring-2 focus-within:ring-lagoon-200 hover:bg-paper">
          <Upload className="h-4 w-4" aria-hidden="true" />
          {uploading ? "Uploading…" : ifu && ifuFileId ? "Replace the PDF" : "Upload a PDF"}
          <input
            id={id("ifu")}
            type="file"
            accept="application/pdf,.pdf"
            className="sr-only"
            aria-label="Instructions for use (PDF)"
            onChange={(e) => {
              void uploadIfu(e.target.files?.[0]);
              e.target.value = "";
            }}
          />
        </label>
        {uploadError && (
          <p role="alert" className="text-xs font-medium text-danger-700">
            {uploadError}
          </p>
        )}
        {errors.ifuFileId?.message && (
          <p role="alert" className="text-xs font-medium text-danger-700">
            {errors.ifuFileId.message}
          </p>
        )}
        {expectsIfu(setClass) && !ifuFileId && (
          <p role="status" className="rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700">
            A loaner set needs its supplier&apos;s instructions for use: bookings refuse loaner sets without one.
          </p>
        )}
      </div>

      <fieldset className="space-y-2">
        <legend className="text-sm font-medium text-ink">Contents</legend>
        {itemsError && (
          <p role="alert" className="text-xs font-medium text-danger-700">
            {itemsError}
          </p>
        )}
        <ol className="space-y-2">
          {items.fields.map((row, index) => {
            const rowErrors = errors.items?.[index];
            return (
              <li key={row.id} className="grid grid-cols-[1fr_5rem_auto] items-start gap-2">
                <div>
                  <label htmlFor={id(`item-${index}`)} className="sr-only">
                    Instrument {index + 1}
                  </label>
                  <Input
                    id={id(`item-${index}`)}
                    placeholder="e.g. Needle holder, Mayo-Hegar 160 mm"
                    aria-invalid={!!rowErrors?.name}
                    {...register(`items.${index}.name`)}
                  />
                  {rowErrors?.name?.message && <p className="mt-1 text-xs font-medium text-danger-700">{rowErrors.name.message}</p>}
                </div>
                <div>
                  <label htmlFor={id(`count-${index}`)} className="sr-only">
                    Count of instrument {index + 1}
                  </label>
                  <Input
                    id={id(`count-${index}`)}
                    inputMode="numeric"
                    className="text-right tabular-nums"
                    aria-invalid={!!rowErrors?.quantity}
                    {...register(`items.${index}.quantity`)}
                  />
                  {rowErrors?.quantity?.message && <p className="mt-1 text-xs font-medium text-danger-700">{rowErrors.quantity.message}</p>}
                </div>
                <div className="flex gap-1">
                  <Button variant="ghost" size="sm" aria-label={`Move instrument ${index + 1} up`} disabled={index === 0} onClick={() => items.move(index, index - 1)}>
                    <ArrowUp className="h-4 w-4" aria-hidden="true" />
                  </Button>
                  <Button
                    variant="ghost"
                    size="sm"
                    aria-label={`Move instrument ${index + 1} down`}
                    disabled={index === items.fields.length - 1}
                    onClick={() => items.move(index, index + 1)}
                  >
                    <ArrowDown className="h-4 w-4" aria-hidden="true" />
                  </Button>
                  <Button variant="ghost" size="sm" aria-label={`Remove instrument ${index + 1}`} onClick={() => items.remove(index)}>
                    <Trash2 className="h-4 w-4" aria-hidden="true" />
                  </Button>
                </div>
              </li>
            );
          })}
        </ol>
        <Button variant="secondary" size="sm" onClick={() => items.append({ name: "", quantity: "1" })}>
          <Plus className="h-4 w-4" aria-hidden="true" />
          Add an instrument
        </Button>
      </fieldset>

      <div className="flex justify-end gap-2 border-t border-line pt-4">
        <Button variant="secondary" onClick={dialog.close}>
          Cancel
        </Button>
        <Button type="submit" disabled={uploading}>
          {isSubmitting ? "Saving…" : target.mode === "create" ? "Add set type" : "Save changes"}
        </Button>
      </div>
    </FormDialog>
  );
}
