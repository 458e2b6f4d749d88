"use client";

import { Plus, X } from "lucide-react";
import { useFieldArray, useWatch } from "react-hook-form";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Input, Select } from "@/components/ui/input";
import { SURCHARGE_KIND_LABELS } from "@/lib/contracts/format";
import { SURCHARGE_KINDS } from "@/lib/pricing/types";
import { type ContractUseForm, errorAt, idOf, invalidProps } from "./form-helpers";

/** Surcharges: one line per kind, a fixed amount per set or a percentage of the set's fee. */
export function SurchargesEditor({ form }: { form: ContractUseForm }) {
  const {
    control,
    register,
    setValue,
    formState: { errors },
  } = form;
  const { fields, append, remove } = useFieldArray({ control, name: "surcharges" });
  const rules = useWatch({ control, name: "surcharges" }) ?? [];
  const unused = SURCHARGE_KINDS.filter((kind) => !rules.some((rule) => rule.kind === kind));
  return (
    <Card>
      <CardHeader
        title="Surcharges"
        description="Added to the processing fee of each set that carries them. A kind not listed is not charged. Percentages apply to the set's own processing fee and never compound."
      />
      <CardBody className="space-y-3">
        {fields.length === 0 && <p className="text-sm text-muted">No surcharges.</p>}
        {fields.map((item, index) => {
          const base = `surcharges.${index}`;
          const basis = rules[index]?.basis ?? "per_set";
          const valuePath = basis === "per_set" ? `${base}.amount` : `${base}.percent`;
          const message = errorAt(errors, `${base}.kind`) ?? errorAt(errors, `${base}.basis`) ?? errorAt(errors, valuePath);
          return (
            <div key={item.id} className="rounded-lg border border-line p-3">
              <div className="grid gap-2 sm:grid-cols-[1fr_14rem_9rem_auto] sm:items-end">
                <div className="space-y-1">
                  <label htmlFor={idOf(`${base}.kind`)} className="block text-xs font-medium text-muted">
                    Surcharge {index + 1}
                  </label>
                  <Select id={idOf(`${base}.kind`)} {...invalidProps(errors, `${base}.kind`)} {...register(`surcharges.${index}.kind`)}>
                    {SURCHARGE_KINDS.map((kind) => (
                      <option key={kind} value={kind}>
                        {SURCHARGE_KIND_LABELS[kind]}
                      </option>
                    ))}
                  </Select>
                </div>
                <div className="space-y-1">
                  <label htmlFor={idOf(`${base}.basis`)} className="block text-xs font-medium text-muted">
                    Charged as
                  </label>
                  <Select
                    id={idOf(`${base}.basis`)}
                    {...register(`surcharges.${index}.basis`, {
                      onChange: () => {
                        setValue(`surcharges.${index}.amount`, "");
                        setValue(`surcharges.${index}.percent`, "");
                      },
                    })}
                  >
                    <option value="per_set">Fixed amount per set</option>
                    <option value="percent_of_fee">Percentage of the fee</option>
                  </Select>
                </div>
                <div className="space-y-1">
                  <label htmlFor={idOf(valuePath)} className="block text-xs font-medium text-muted">
                    {basis === "per_set" ? "Amount per set" : "Percentage"}
                  </label>
                  {basis === "per_set" ? (
                    <Input
                      key="amount"
                      id={idOf(valuePath)}
                      inputMode="decimal"
                      placeholder="0.00"
                      {...invalidProps(errors, valuePath)}
                      {...register(`surcharges.${index}.amount`)}
                    />
                  ) : (
                    <Input
                      key="percent"
                      id={idOf(valuePath)}
                      inputMode="decimal"
                      placeholder="e.g. 50"
                      {...invalidProps(errors, valuePath)}
                      {...register(`surcharges.${index}.percent`)}
                    />
                  )}
                </div>
                <Button variant="ghost" onClick={() => remove(index)} aria-label={`Remove surcharge ${index + 1}`}>
                  <X className="h-4 w-4" aria-hidden="true" />
                </Button>
              </div>
              {message && (
                <p id={`${idOf(valuePath)}-error`} role="alert" className="mt-2 text-xs font-medium text-danger-700">
                  {message}
                </p>
              )}
            </div>
          );
        })}
        <Button
          variant="secondary"
          disabled={unused.length === 0}
          onClick={() => append({ kind: unused[0] ?? "express", basis: "per_set", amount: "", percent: "" })}
        >
          <Plus className="h-4 w-4" aria-hidden="true" />
          Add surcharge
        </Button>
      </CardBody>
    </Card>
  );
}
