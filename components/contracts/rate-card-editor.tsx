"use client";

import { Plus, X } from "lucide-react";
import { useFieldArray, useWatch } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Input } from "@/components/ui/input";
import { SET_CLASS_LABELS } from "@/lib/catalogue/vocabulary";
import { BAND_LIMIT } from "@/lib/contracts/schemas";
import { type ContractUseForm, errorAt, idOf, invalidProps } from "./form-helpers";

/** The processing fee of every set class, as graduated monthly volume bands. */
export function RateCardEditor({ form }: { form: ContractUseForm }) {
  const rates = useWatch({ control: form.control, name: "rates" });
  const listError = errorAt(form.formState.errors, "rates");
  return (
    <Card>
      <CardHeader
        title="Rate card"
        description="Every set class needs a price. One band is a flat price; with more, each band but the last goes up to a count of sets in the calendar month, and the last, left empty, covers every set above it. Each band is priced at its own rate."
      />
      <CardBody className="space-y-4">
        {listError && (
          <p role="alert" className="text-xs font-medium text-danger-700">
            {listError}
          </p>
        )}
        <div className="grid gap-4 lg:grid-cols-2">
          {rates.map((rate, index) => (
            <ClassBands key={rate.setClass} form={form} index={index} />
          ))}
        </div>
      </CardBody>
    </Card>
  );
}

function ClassBands({ form, index }: { form: ContractUseForm; index: number }) {
  const {
    control,
    register,
    getValues,
    formState: { errors },
  } = form;
  const name = `rates.${index}.bands` as const;
  const { fields, insert, remove } = useFieldArray({ control, name });
  const setClass = getValues(`rates.${index}.setClass`);
  const label = SET_CLASS_LABELS[setClass];
  const headingId = idOf(`rates.${index}`);
  const listError = errorAt(errors, name);
  return (
    <section aria-labelledby={headingId} className="rounded-lg border border-line p-3">
      <div className="flex items-start justify-between gap-2">
        <h3 id={headingId} className="text-sm font-semibold text-ink">
          {label}
        </h3>
        <Button
          variant="secondary"
          size="sm"
          disabled={fields.length >= BAND_LIMIT}
          // A new band goes before the open-ended last one.
          onClick={() => insert(Math.max(0, fields.length - 1), { upToQuantity: "", unitPrice: "" })}
        >
          <Plus className="h-4 w-4" aria-hidden="true" />
          Add band<span className="sr-only"> to {label}</span>
        </Button>
      </div>
      {listError && (
        <p role="alert" className="mt-1 text-xs font-medium text-danger-700">
          {listError}
        </p>
      )}
      <table className="mt-2 w-full text-sm">
        <thead className="text-left text-xs text-muted">
          <tr>
            <th scope="col" className="w-14 py-1 font-medium">
              Band
            </th>
            <th scope="col" className="py-1 font-medium">
              Up to (sets a month)
            </th>
            <th scope="col" className="py-1 font-medium">
              Price per set
            </th>
            <th scope="col">
              <span className="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {fields.map((item, band) => {
            const base = `${name}.${band}`;
            const last = band === fields.length - 1;
            const upToError = errorAt(errors, `${base}.upToQuantity`);
            const priceError = errorAt(errors, `${base}.unitPrice`);
            return (
              <tr key={item.id} className="align-top">
                <td className="py-1 pr-2 pt-3 text-muted">{band + 1}</td>
                <td className="py-1 pr-2">
                  <label htmlFor={idOf(`${base}.upToQuantity`)} className="sr-only">
                    {label}, band {band + 1}, up to
                  </label>
                  <Input
                    id={idOf(`${base}.upToQuantity`)}
                    inputMode="numeric"
                    placeholder={last ? "no limit" : "e.g. 500"}
                    {...invalidProps(errors, `${base}.upToQuantity`)}
                    {...register(`${name}.${band}.upToQuantity`)}
                  />
                  {upToError && (
                    <p id={`${idOf(`${base}.upToQuantity`)}-error`} role="alert" className="mt-1 text-xs font-medium text-danger-700">
                      {upToError}
                    </p>
                  )}
                </td>
                <td className="py-1 pr-2">
                  <label htmlFor={idOf(`${base}.unitPrice`)} className="sr-only">
                    {label}, band {band + 1}, price per set
                  </label>
                  <Input
                    id={idOf(`${base}.unitPrice`)}
                    inputMode="decimal"
                    placeholder="0.00"
                    {...invalidProps(errors, `${base}.unitPrice`)}
                    {...register(`${name}.${band}.unitPrice`)}
                  />
                  {priceError && (
                    <p id={`${idOf(`${base}.unitPrice`)}-error`} role="alert" className="mt-1 text-xs font-medium text-danger-700">
                      {priceError}
                    </p>
                  )}
                </td>
                <td className="py-1 pt-2">
                  <Button
                    variant="ghost"
                    size="sm"
                    disabled={fields.length === 1}
                    onClick={() => remove(band)}
                    aria-label={`Remove ${label} band ${band + 1}`}
                  >
                    <X className="h-4 w-4" aria-hidden="true" />
                  </Button>
                </td>
              </tr>
            );
          })}
        </tbody>
      </table>
    </section>
  );
}
