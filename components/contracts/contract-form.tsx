"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import Link from "next/link";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import { createContractAction, updateContractAction } from "@/lib/contracts/actions";
import type { ContractFormValues } from "@/lib/contracts/form-values";
import { CLOCK_STOP_LABELS, VAT_CATEGORY_LABELS } from "@/lib/contracts/format";
import { contractVersionSchema } from "@/lib/contracts/schemas";
import { errorAt, type FormOutput, type FormValues, idOf, invalidProps } from "./form-helpers";
import { RateCardEditor } from "./rate-card-editor";
import { ServiceCalendarEditor } from "./service-calendar-editor";
import { SurchargesEditor } from "./surcharges-editor";

/**
 * The contract version form: validity, turnaround, money terms, the service calendar, the rate
 * card and surcharges. `mode` "create" writes a new version (a first contract or the next
 * version of one), "edit" corrects an existing one.
 */
export function ContractForm({
  mode,
  contractId,
  defaultValues,
  customers,
  lockedCustomerName,
  cancelHref,
}: {
  mode: "create" | "edit";
  contractId?: number;
  defaultValues: ContractFormValues;
  customers: { id: number; name: string }[];
  /** Shown instead of the customer choice when the customer is given (correction, next version). */
  lockedCustomerName?: string;
  cancelHref: string;
}) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const form = useForm<FormValues, unknown, FormOutput>({
    resolver: zodResolver(contractVersionSchema),
    defaultValues,
    mode: "onSubmit",
    reValidateMode: "onChange",
  });
  const {
    register,
    handleSubmit,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = form;

  // The server parses the form's own text again, so it gets the raw values, not the parsed ones.
  const onValid = async () => {
    setFormError(null);
    const raw = getValues();
    const result =
      mode === "create"
        ? await createContractAction(raw)
        : await updateContractAction({ id: contractId!, values: raw });
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      toast.error(result.error.message);
      // The reason is at the top of a long form; bring it into view.
      requestAnimationFrame(() => document.getElementById("contract-form-error")?.scrollIntoView({ behavior: "smooth", block: "center" }));
      return;
    }
    const changed: string[] | null = "changed" in result.data ? (result.data.changed as string[]) : null;
    if (changed !== null && changed.length === 0) toast.info("Nothing changed, so nothing was saved.");
    else toast.success(mode === "create" ? `Version ${raw.reference} saved` : `Corrections to ${raw.reference} saved`);
    router.push(`/unit/contracts/${result.data.id}`);
    router.refresh();
  };
  const onInvalid = () => setFormError("Some fields need attention; each is marked below.");

  const field = (path: string) => invalidProps(errors, path);

  return (
    <form onSubmit={handleSubmit(onValid, onInvalid)} noValidate className="space-y-6" aria-label={mode === "create" ? "New contract version" : "Correct contract version"}>
      <div id="contract-form-error">
        <FormError message={formError} />
      </div>
      <fieldset disabled={isSubmitting} className="space-y-6">
        <Card>
          <CardHeader title="Customer and validity" description="Local dates in the unit's time zone; the first and the last day both count." />
          <CardBody className="grid gap-4 sm:grid-cols-2">
            {lockedCustomerName ? (
              <div className="space-y-1.5">
                <p className="text-sm font-medium text-ink">Customer</p>
                <p className="flex h-10 items-center rounded-lg bg-paper px-3 text-sm text-ink">{lockedCustomerName}</p>
                <input type="hidden" {...register("organisationId")} />
                {errorAt(errors, "organisationId") && (
                  <p role="alert" className="text-xs font-medium text-danger-700">
                    {errorAt(errors, "organisationId")}
                  </p>
                )}
              </div>
            ) : (
              <Field id={idOf("organisationId")} label="Customer" error={errorAt(errors, "organisationId")}>
                <Select id={idOf("organisationId")} {...field("organisationId")} {...register("organisationId")}>
                  <option value="">Choose a customer</option>
                  {customers.map((c) => (
                    <option key={c.id} value={c.id}>
                      {c.name}
                    </option>
                  ))}
                </Select>
              </Field>
            )}
            <Field id={idOf("reference")} label="Reference" hint="Unique across every contract, e.g. QMH-2027-01." error={errorAt(errors, "reference")}>
              <Input id={idOf("reference")} autoComplete="off" {...field("reference")} {...register("reference")} />
            </Field>
            <Field id={idOf("validFrom")} label="Valid from" error={errorAt(errors, "validFrom")}>
              <Input id={idOf("validFrom")} type="date" {...field("validFrom")} {...register("validFrom")} />
            </Field>
            <Field id={idOf("validUntil")} label="Valid until" hint="The last day. Leave empty for an open-ended version." error={errorAt(errors, "validUntil")}>
              <Input id={idOf("validUntil")} type="date" {...field("validUntil")} {...register("validUntil")} />
            </Field>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Turnaround" description="Service hours from receipt at the unit, counted in the service calendar below." />
          <CardBody className="grid gap-4 sm:grid-cols-3">
            <Field id={idOf("turnaround.standardHours")} label="Standard (hours)" error={errorAt(errors, "turnaround.standardHours")}>
              <Input id={idOf("turnaround.standardHours")} inputMode="numeric" {...field("turnaround.standardHours")} {...register("turnaround.standardHours")} />
            </Field>
            <Field id={idOf("turnaround.expressHours")} label="Express (hours)" hint="Quicker than standard." error={errorAt(errors, "turnaround.expressHours")}>
              <Input id={idOf("turnaround.expressHours")} inputMode="numeric" {...field("turnaround.expressHours")} {...register("turnaround.expressHours")} />
            </Field>
            <Field id={idOf("clockStopsAt")} label="The clock stops at" error={errorAt(errors, "clockStopsAt")}>
              <Select id={idOf("clockStopsAt")} {...register("clockStopsAt")}>
                {(["delivered", "released"] as const).map((stop) => (
                  <option key={stop} value={stop}>
                    {CLOCK_STOP_LABELS[stop].charAt(0).toUpperCase() + CLOCK_STOP_LABELS[stop].slice(1)}
                  </option>
                ))}
              </Select>
            </Field>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Money terms" description="Amounts in the contract's currency, like 1250.00; percentages like 20 or 5.5." />
          <CardBody className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3">
            <Field id={idOf("currency")} label="Currency" hint="ISO 4217 code with two decimals, e.g. GBP or EUR." error={errorAt(errors, "currency")}>
              <Input id={idOf("currency")} maxLength={3} autoComplete="off" className="uppercase" {...field("currency")} {...register("currency")} />
            </Field>
            <Field id={idOf("vat.category")} label="VAT category" error={errorAt(errors, "vat.category")}>
              <Select id={idOf("vat.category")} {...register("vat.category")}>
                {(["S", "Z"] as const).map((c) => (
                  <option key={c} value={c}>
                    {VAT_CATEGORY_LABELS[c]}
                  </option>
                ))}
              </Select>
            </Field>
            <Field id={idOf("vat.ratePercent")} label="VAT rate (%)" error={errorAt(errors, "vat.ratePercent")}>
              <Input id={idOf("vat.ratePercent")} inputMode="decimal" {...field("vat.ratePercent")} {...register("vat.ratePercent")} />
            </Field>
            <Field id={idOf("paymentTermsDays")} label="Payment terms (days)" error={errorAt(errors, "paymentTermsDays")}>
              <Input id={idOf("paymentTermsDays")} inputMode="numeric" {...field("paymentTermsDays")} {...register("paymentTermsDays")} />
            </Field>
            <Field id={idOf("minimumMonthlyFee")} label="Minimum monthly fee" hint="0.00 for none." error={errorAt(errors, "minimumMonthlyFee")}>
              <Input id={idOf("minimumMonthlyFee")} inputMode="decimal" {...field("minimumMonthlyFee")} {...register("minimumMonthlyFee")} />
            </Field>
            <Field
              id={idOf("slaCreditPercent")}
              label="Credit for a late set (%)"
              hint="Share of that set's processing fee."
              error={errorAt(errors, "slaCreditPercent")}
            >
              <Input id={idOf("slaCreditPercent")} inputMode="decimal" {...field("slaCreditPercent")} {...register("slaCreditPercent")} />
            </Field>
          </CardBody>
        </Card>

        <ServiceCalendarEditor form={form} />
        <RateCardEditor form={form} />
        <SurchargesEditor form={form} />

        <Card>
          <CardHeader title="Notes" />
          <CardBody>
            <Field id={idOf("notes")} label="Notes (optional)" hint="Shown to the customer with the contract." error={errorAt(errors, "notes")}>
              <Textarea id={idOf("notes")} {...register("notes")} />
            </Field>
          </CardBody>
        </Card>

        <div className="flex flex-wrap justify-end gap-2">
          <Button variant="secondary" asChild>
            <Link href={cancelHref}>Cancel</Link>
          </Button>
          <Button type="submit">{isSubmitting ? "Saving…" : mode === "create" ? "Save version" : "Save corrections"}</Button>
        </div>
      </fieldset>
    </form>
  );
}

