"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQuery } from "@tanstack/react-query";
import { AlertTriangle, CalendarClock, Plus, ScanLine, X } from "lucide-react";
import { useRouter } from "next/navigation";
import { useDeferredValue, useMemo, useRef, useState } from "react";
import { useFieldArray, useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import { formatDateTime } from "@/lib/format";
import { parseScan } from "@/lib/labels/gs1";
import { amendPickupAction, bookPickupAction } from "@/lib/orders/actions";
import type { BookableSet } from "@/lib/orders/bookable";
import { type BookingFields, type BookingInput, bookingSchema } from "@/lib/orders/schemas";

interface Preview {
  problems: { field: string; message: string }[];
  outOfHours: boolean;
  plan: null | {
    promisedAt: string;
    meetsNeededBy: boolean;
    earliestStandard: string;
    earliestExpress: string;
    suggestion: string;
    suggestionMessage: string;
  };
  quote: null | {
    currency: string;
    processingMinor: number;
    expressSurchargeMinor: number;
    heavySoilSurchargeMinor: number;
    outOfHoursSurchargeMinor: number;
    loanerSurchargeMinor: number;
  };
}

const money = (minor: number, currency: string) =>
  new Intl.NumberFormat("en-GB", { style: "currency", currency }).format(minor / 100);

/** Book a pickup (or change one before collection), with the promised return shown as you go. */
export function BookingForm({
  sites,
  initial,
  orderId,
  timeZone,
}: {
  sites: { id: number; name: string }[];
  initial: BookingInput;
  orderId?: number;
  timeZone: string;
}) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const [scan, setScan] = useState("");
  const [scanMessage, setScanMessage] = useState<string | null>(null);
  const [filter, setFilter] = useState("");
  const scanRef = useRef<HTMLInputElement>(null);
  const {
    register,
    control,
    handleSubmit,
    watch,
    setValue,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<BookingInput, unknown, BookingFields>({ resolver: zodResolver(bookingSchema), defaultValues: initial });
  const extras = useFieldArray({ control, name: "extras" });
  const values = watch();
  const siteId = Number(values.siteId);
  const setIds = (values.setIds ?? []).map(Number);

  const bookable = useQuery({
    queryKey: ["bookable-sets", siteId, orderId],
    queryFn: () => fetchJson<{ rows: BookableSet[] }>(`/api/orders/bookable-sets${toQueryString({ siteId, keepOrderId: orderId })}`),
    enabled: siteId > 0,
  });
  const sets = useMemo(() => bookable.data?.rows ?? [], [bookable.data]);

  // The preview follows the form, a moment behind the typing.
  const deferred = useDeferredValue(JSON.stringify({ ...values, ignoreOrderId: orderId }));
  // Nothing to preview until there is something to collect and the times are in.
  const chosen = setIds.length + (values.extras?.length ?? 0) > 0;
  const timed = !!values.collectionFrom && !!values.collectionUntil && !!values.neededBackBy;
  const ready = chosen && timed && siteId > 0;
  const preview = useQuery({
    queryKey: ["booking-preview", deferred],
    queryFn: () =>
      fetchJson<Preview>("/api/orders/preview", { method: "POST", body: deferred, headers: { "content-type": "application/json" } }),
    enabled: ready,
    retry: false,
  });

  const toggle = (id: number, on: boolean) => {
    const next = on ? [...new Set([...setIds, id])] : setIds.filter((s) => s !== id);
    setValue("setIds", next, { shouldValidate: false, shouldDirty: true });
  };

  const addScanned = () => {
    const raw = scan.trim();
    if (!raw) return;
    let found: BookableSet | undefined;
    try {
      const result = parseScan(raw);
      if (result.kind === "set") found = sets.find((s) => s.giai === result.giai);
      else if (result.kind === "typed") found = sets.find((s) => s.serial.toLowerCase() === result.code.toLowerCase());
      if (!found) {
        setScanMessage(
          result.kind === "set" || result.kind === "typed"
            ? `${raw} is not a set of this site that can be booked now (it may be at the unit already, retired, or from another site).`
            : "That barcode is a product code, not one of your sets.",
        );
      }
    } catch (error) {
      setScanMessage(error instanceof Error ? error.message : "That code could not be read.");
    }
    if (found) {
      toggle(found.id, true);
      setScanMessage(`Added ${found.serial} — ${found.name}.`);
    }
    setScan("");
    scanRef.current?.focus();
  };

  const onSubmit = async () => {
    setFormError(null);
    const raw = getValues();
    const result = orderId ? await amendPickupAction({ ...raw, orderId }) : await bookPickupAction(raw);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(orderId ? "Booking changed" : "Pickup booked");
    router.push(`/clinic/orders/${orderId ?? (result.data as { orderId: number }).orderId}`);
    router.refresh();
  };

  // Once the preview finds nothing wrong, an earlier refusal no longer applies.
  const previewClear = preview.data?.problems.length === 0;
  const shown = sets.filter((s) => !filter || `${s.serial} ${s.name}`.toLowerCase().includes(filter.toLowerCase()));
  const p = preview.data;
  const quote = p?.quote;

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="grid gap-6 lg:grid-cols-[1fr_22rem]">
      <div className="space-y-6">
        <FormError message={previewClear ? null : formError} />
        <Card>
          <CardHeader title="Where and which sets" />
          <CardBody className="space-y-4">
            {orderId || sites.length === 1 ? (
              <div className="text-sm">
                <p className="font-medium">Site</p>
                <p>{sites.find((s) => s.id === siteId)?.name}</p>
                <input type="hidden" {...register("siteId")} />
              </div>
            ) : (
              <Field id="siteId" label="Site" error={errors.siteId?.message}>
                <Select id="siteId" {...register("siteId", { onChange: () => setValue("setIds", []) })}>
                  {sites.map((s) => (
                    <option key={s.id} value={s.id}>
                      {s.name}
                    </option>
                  ))}
                </Select>
              </Field>
            )}
            <div className="space-y-1.5">
              <label htmlFor="scan" className="block text-sm font-medium">
                Scan a set&apos;s barcode, or type its serial
              </label>
              <div className="flex gap-2">
                <Input
                  id="scan"
                  ref={scanRef}
                  value={scan}
                  autoComplete="off"
                  placeholder="e.g. QMH-000123"
                  onChange={(e) => setScan(e.target.value)}
                  onKeyDown={(e) => {
                    if (e.key === "Enter") {
                      e.preventDefault();
                      addScanned();
                    }
                  }}
                />
                <Button variant="secondary" onClick={addScanned}>
                  <ScanLine className="h-4 w-4" aria-hidden="true" /> Add
                </Button>
              </div>
              {scanMessage && (
                <p role="status" className="text-xs text-ink-soft">
                  {scanMessage}
                </p>
              )}
            </div>
            <fieldset className="space-y-2">
              <legend className="text-sm font-medium">
                Or pick from this site&apos;s sets ({setIds.length} chosen of {sets.length} that can be booked)
              </legend>
              <Input type="search" aria-label="Filter the sets" placeholder="Filter by name or serial" value={filter} onChange={(e) => setFilter(e.target.value)} />
              <ul className="max-h-72 divide-y divide-line overflow-y-auto rounded-lg border border-line">
                {shown.map((s) => (
                  <li key={s.id}>
                    <label className="flex cursor-pointer items-center gap-3 px-3 py-2 text-sm hover:bg-paper">
                      <input type="checkbox" className="h-5 w-5 accent-lagoon-700" checked={setIds.includes(s.id)} onChange={(e) => toggle(s.id, e.target.checked)} />
                      <span className="flex-1">
                        <span className="font-medium">{s.name}</span> <span className="text-muted">{s.serial}</span>
                      </span>
                      {s.loaner && <Badge tone={s.hasIfu ? "info" : "warn"}>{s.hasIfu ? "Loaner" : "Loaner, no IFU on file"}</Badge>}
                    </label>
                  </li>
                ))}
                {shown.length === 0 && <li className="px-3 py-4 text-sm text-muted">{bookable.isLoading ? "Loading…" : "No sets match."}</li>}
              </ul>
              {errors.setIds && (
                <p role="alert" className="text-xs font-medium text-danger-700">
                  {errors.setIds.message ?? errors.setIds.root?.message}
                </p>
              )}
            </fieldset>
            <fieldset className="space-y-2">
              <legend className="text-sm font-medium">Other items without a barcode (optional)</legend>
              {extras.fields.map((field, index) => (
                <div key={field.id} className="flex gap-2">
                  <Input aria-label={`Item ${index + 1}`} placeholder="e.g. loose retractor" {...register(`extras.${index}.description`)} />
                  <Input aria-label={`How many of item ${index + 1}`} className="w-24" inputMode="numeric" {...register(`extras.${index}.quantity`)} />
                  <Button variant="ghost" onClick={() => extras.remove(index)} aria-label={`Remove item ${index + 1}`}>
                    <X className="h-4 w-4" aria-hidden="true" />
                  </Button>
                </div>
              ))}
              <Button variant="ghost" size="sm" onClick={() => extras.append({ description: "", quantity: 1 })}>
                <Plus className="h-4 w-4" aria-hidden="true" /> Add an item
              </Button>
            </fieldset>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="When" description={`Times are local (${timeZone}).`} />
          <CardBody className="grid gap-4 sm:grid-cols-2">
            <Field id="collectionFrom" label="Collect from" error={errors.collectionFrom?.message}>
              <Input id="collectionFrom" type="datetime-local" aria-invalid={!!errors.collectionFrom} {...register("collectionFrom")} />
            </Field>
            <Field id="collectionUntil" label="Collect by" error={errors.collectionUntil?.message}>
              <Input id="collectionUntil" type="datetime-local" aria-invalid={!!errors.collectionUntil} {...register("collectionUntil")} />
            </Field>
            <Field id="neededBackBy" label="Needed back by" hint="When the sets are needed for the procedure." error={errors.neededBackBy?.message} className="sm:col-span-2">
              <Input id="neededBackBy" type="datetime-local" aria-invalid={!!errors.neededBackBy} {...register("neededBackBy")} />
            </Field>
            <fieldset className="sm:col-span-2">
              <legend className="mb-2 text-sm font-medium">Service level</legend>
              <div className="grid gap-3 sm:grid-cols-2">
                {(["standard", "express"] as const).map((level) => (
                  <label
                    key={level}
                    className="flex cursor-pointer items-start gap-3 rounded-lg border border-line-strong p-3 has-[:checked]:border-lagoon-600 has-[:checked]:bg-lagoon-50"
                  >
                    <input type="radio" value={level} className="mt-1 h-4 w-4 accent-lagoon-700" {...register("serviceLevel")} />
                    <span className="text-sm">
                      <span className="block font-medium">{level === "standard" ? "Standard" : "Express"}</span>
                      <span className="text-muted">
                        {p?.plan ? `Back by ${formatDateTime(level === "standard" ? p.plan.earliestStandard : p.plan.earliestExpress, timeZone)}` : "Back time shown once the sets and times are in"}
                        {level === "express" && quote && quote.expressSurchargeMinor > 0 && ` · adds ${money(quote.expressSurchargeMinor, quote.currency)}`}
                      </span>
                    </span>
                  </label>
                ))}
              </div>
            </fieldset>
            <label className="flex items-center gap-3 text-sm sm:col-span-2">
              <input type="checkbox" className="h-5 w-5 accent-lagoon-700" {...register("heavySoil")} />
              Heavily soiled, or not pre-cleaned at the point of use (a surcharge applies)
            </label>
            <label className="flex items-center gap-3 text-sm sm:col-span-2">
              <input type="checkbox" className="h-5 w-5 accent-lagoon-700" {...register("keepInStore")} />
              Keep the sets in the unit&apos;s store after processing; we will ask for them when needed
            </label>
            <Field id="notes" label="Notes for the unit (optional)" error={errors.notes?.message} className="sm:col-span-2">
              <Textarea id="notes" {...register("notes")} />
            </Field>
          </CardBody>
        </Card>
      </div>

      <aside className="space-y-4 lg:sticky lg:top-6 lg:self-start" aria-live="polite">
        <Card>
          <CardHeader title="Your booking" />
          <CardBody className="space-y-3 text-sm">
            <p>
              {setIds.length} {setIds.length === 1 ? "set" : "sets"}
              {values.extras?.length ? ` and ${values.extras.length} other ${values.extras.length === 1 ? "item" : "items"}` : ""}
            </p>
            {!ready && (
              <p className="text-muted">
                {!chosen ? "Choose the sets to collect to see when they will be back." : "Fill in the times to see when the sets will be back."}
              </p>
            )}
            {p?.plan && (
              <div className={`rounded-lg p-3 ${p.plan.meetsNeededBy ? "bg-ok-50" : "bg-warn-50"}`} data-testid="promised-return">
                <p className="flex items-center gap-2 font-medium">
                  <CalendarClock className="h-4 w-4" aria-hidden="true" />
                  Back by {formatDateTime(p.plan.promisedAt, timeZone)}
                </p>
                <p className="mt-1 text-ink-soft">{p.plan.suggestionMessage}</p>
                {p.plan.suggestion === "switch_to_express" && (
                  <Button size="sm" variant="accent" className="mt-2" onClick={() => setValue("serviceLevel", "express")}>
                    Switch to express
                  </Button>
                )}
              </div>
            )}
            {p?.outOfHours && <p className="text-warn-700">The collection window falls outside the unit&apos;s service hours: an out-of-hours surcharge applies.</p>}
            {quote && (
              <dl className="grid grid-cols-[1fr_auto] gap-x-3 gap-y-1">
                <dt className="text-muted">Processing (estimate)</dt>
                <dd className="text-right tabular-nums">{money(quote.processingMinor, quote.currency)}</dd>
                {values.serviceLevel === "express" && (
                  <>
                    <dt className="text-muted">Express</dt>
                    <dd className="text-right tabular-nums">{money(quote.expressSurchargeMinor, quote.currency)}</dd>
                  </>
                )}
                {quote.heavySoilSurchargeMinor > 0 && (
                  <>
                    <dt className="text-muted">Heavy soil</dt>
                    <dd className="text-right tabular-nums">{money(quote.heavySoilSurchargeMinor, quote.currency)}</dd>
                  </>
                )}
                {quote.outOfHoursSurchargeMinor > 0 && (
                  <>
                    <dt className="text-muted">Out of hours</dt>
                    <dd className="text-right tabular-nums">{money(quote.outOfHoursSurchargeMinor, quote.currency)}</dd>
                  </>
                )}
                {quote.loanerSurchargeMinor > 0 && (
                  <>
                    <dt className="text-muted">Loaner handling</dt>
                    <dd className="text-right tabular-nums">{money(quote.loanerSurchargeMinor, quote.currency)}</dd>
                  </>
                )}
                <dt className="col-span-2 pt-1 text-xs text-muted">
                  Estimated at your contract&apos;s first-band prices, before VAT; the invoice prices the month&apos;s volume.
                </dt>
              </dl>
            )}
            {p && p.problems.length > 0 && (
              <ul className="space-y-1.5" data-testid="booking-problems">
                {p.problems.map((problem) => (
                  <li key={problem.message} className="flex gap-2 text-danger-700">
                    <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                    {problem.message}
                  </li>
                ))}
              </ul>
            )}
            {preview.error && <p className="text-danger-700">{preview.error.message}</p>}
            <Button type="submit" size="lg" className="w-full" disabled={isSubmitting}>
              {isSubmitting ? "Saving…" : orderId ? "Save changes" : "Book pickup"}
            </Button>
          </CardBody>
        </Card>
      </aside>
    </form>
  );
}
