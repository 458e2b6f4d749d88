"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useQueryClient } from "@tanstack/react-query";
import { AlertTriangle, CheckCircle2, ScanLine } from "lucide-react";
import { type InputHTMLAttributes, type Ref, useEffect, useRef, useState } from "react";
import { useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Card, CardBody } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input } from "@/components/ui/input";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import { formatDateTime } from "@/lib/format";
import { recordUseAction } from "@/lib/procedures/actions";
import { type RecordUseFields, type RecordUseInput, recordUseSchema } from "@/lib/procedures/schemas";
import type { ScannedSet } from "@/lib/procedures/service";

/** Scan a set taken from the store, see what it is, confirm the checks, record its use. */
export function RecordUse({ timeZone }: { timeZone: string }) {
  const queryClient = useQueryClient();
  const scanRef = useRef<HTMLInputElement>(null);
  const [code, setCode] = useState("");
  const [looking, setLooking] = useState(false);
  const [scanError, setScanError] = useState<string | null>(null);
  const [scanned, setScanned] = useState<(ScannedSet & { code: string }) | null>(null);
  const [formError, setFormError] = useState<string | null>(null);
  // Bumped to put the cursor back in the scan field, ready for the next set.
  const [scanTurn, setScanTurn] = useState(0);
  const {
    register,
    handleSubmit,
    reset,
    getValues,
    setError,
    setFocus,
    formState: { errors, isSubmitting },
  } = useForm<RecordUseInput, unknown, RecordUseFields>({
    resolver: zodResolver(recordUseSchema),
    defaultValues: { code: "", theatre: "", caseReference: "" },
  });

  useEffect(() => {
    // Focused with its text selected, so the next scan replaces what is there.
    if (scanTurn > 0) scanRef.current?.select();
  }, [scanTurn]);

  useEffect(() => {
    if (scanned && !scanned.problem) setFocus(getValues("theatre") ? "caseReference" : "theatre");
  }, [scanned, setFocus, getValues]);

  const startOver = () => {
    setScanned(null);
    setScanError(null);
    setFormError(null);
    setCode("");
    setScanTurn((n) => n + 1);
  };

  const lookUp = async () => {
    const raw = code.trim();
    if (!raw) {
      setScanError("Scan the set's label or type its serial.");
      return;
    }
    setLooking(true);
    setScanError(null);
    try {
      const found = await fetchJson<ScannedSet>(`/api/procedures/check${toQueryString({ code: raw })}`);
      setScanned({ ...found, code: raw });
      if (found.problem) setScanTurn((n) => n + 1);
      // Keep the theatre between sets: one procedure often takes several.
      reset({ code: raw, theatre: getValues("theatre"), caseReference: getValues("caseReference") });
    } catch (error) {
      setScanError(error instanceof Error ? error.message : "That code could not be looked up.");
      setScanned(null);
      setScanTurn((n) => n + 1);
    } finally {
      setLooking(false);
    }
  };

  const onSubmit = async (values: RecordUseFields) => {
    setFormError(null);
    const result = await recordUseAction(values);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success(`Recorded: ${result.data.serial} used in ${values.theatre}, case ${values.caseReference}`);
    await queryClient.invalidateQueries({ queryKey: ["procedure-uses"] });
    reset({ code: "", theatre: values.theatre, caseReference: values.caseReference, packChecked: undefined, indicatorChecked: undefined });
    startOver();
  };

  return (
    <div className="space-y-4">
      <Card>
        <CardBody className="space-y-3">
          <form
            onSubmit={(e) => {
              e.preventDefault();
              void lookUp();
            }}
            className="space-y-3"
          >
            <Field
              id="use-scan"
              label="Scan the set's label"
              hint="Scan the barcode, or type the serial (e.g. QMH-000123) and press Look up."
              error={scanError ?? undefined}
            >
              <Input
                id="use-scan"
                ref={scanRef}
                autoFocus
                autoComplete="off"
                autoCapitalize="characters"
                spellCheck={false}
                enterKeyHint="go"
                className="h-14 text-lg"
                value={code}
                aria-invalid={!!scanError}
                aria-describedby={scanError ? "use-scan-error" : "use-scan-hint"}
                onChange={(e) => setCode(e.target.value)}
              />
            </Field>
            <Button type="submit" size="lg" className="w-full" disabled={looking}>
              <ScanLine className="h-5 w-5" aria-hidden="true" />
              {looking ? "Looking up…" : "Look up"}
            </Button>
          </form>
        </CardBody>
      </Card>

      {scanned && (
        <Card aria-live="polite" data-testid="scanned-set">
          <CardBody className="space-y-4">
            <div>
              <p className="text-lg font-semibold text-ink">{scanned.setName}</p>
              <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
                <dt className="text-muted">Serial</dt>
                <dd className="font-medium tabular-nums" data-testid="scanned-serial">
                  {scanned.serial}
                </dd>
                {scanned.siteName && (
                  <>
                    <dt className="text-muted">Site</dt>
                    <dd>{scanned.siteName}</dd>
                  </>
                )}
                {scanned.deliveredAt && (
                  <>
                    <dt className="text-muted">Delivered</dt>
                    <dd className="tabular-nums">{formatDateTime(scanned.deliveredAt, timeZone)}</dd>
                  </>
                )}
                <dt className="text-muted">Expiry</dt>
                <dd data-testid="scanned-expiry">{scanned.expiryText}</dd>
              </dl>
            </div>

            {scanned.problem ? (
              <div className="space-y-3">
                <p role="alert" className="flex gap-2 rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-3 text-sm text-danger-700">
                  <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                  <span>{scanned.problem}</span>
                </p>
                <Button variant="secondary" size="lg" className="w-full" onClick={startOver}>
                  Scan another set
                </Button>
              </div>
            ) : (
              <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-4">
                <FormError message={formError} />
                <input type="hidden" {...register("code")} />
                <fieldset disabled={isSubmitting} className="space-y-4">
                  <p className="rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700">
                    Never enter a patient&apos;s name. Use the theatre or room and your own case number.
                  </p>
                  <Field id="use-theatre" label="Theatre or room" hint="For example Theatre 2 or Treatment room B." error={errors.theatre?.message}>
                    <Input id="use-theatre" autoComplete="off" className="h-12 text-base" aria-invalid={!!errors.theatre} {...register("theatre")} />
                  </Field>
                  <Field
                    id="use-case"
                    label="Case number"
                    hint="Letters, digits, - and / only, as on your theatre list. Not a name or a date of birth."
                    error={errors.caseReference?.message}
                  >
                    <Input
                      id="use-case"
                      autoComplete="off"
                      autoCapitalize="characters"
                      spellCheck={false}
                      className="h-12 text-base"
                      aria-invalid={!!errors.caseReference}
                      {...register("caseReference")}
                    />
                  </Field>
                  <fieldset className="space-y-2">
                    <legend className="mb-1 text-sm font-medium text-ink">Before opening, I checked that</legend>
                    <CheckRow id="use-pack" label="the pack is intact and dry" error={errors.packChecked?.message} {...register("packChecked")} />
                    <CheckRow
                      id="use-indicator"
                      label="the indicator has changed colour"
                      error={errors.indicatorChecked?.message}
                      {...register("indicatorChecked")}
                    />
                  </fieldset>
                  <p className="text-xs text-muted">
                    Steamlane records these checks; it does not make them. Whether a set may be used is decided by your checks, your local
                    procedures and the unit&apos;s validated processes.
                  </p>
                  <Button type="submit" size="lg" className="w-full">
                    <CheckCircle2 className="h-5 w-5" aria-hidden="true" />
                    {isSubmitting ? "Recording…" : "Record use"}
                  </Button>
                  <Button variant="ghost" size="lg" className="w-full" onClick={startOver}>
                    Cancel and scan another
                  </Button>
                </fieldset>
              </form>
            )}
          </CardBody>
        </Card>
      )}
    </div>
  );
}

function CheckRow({ id, label, error, ...input }: { id: string; label: string; error?: string } & InputHTMLAttributes<HTMLInputElement> & { ref?: Ref<HTMLInputElement> }) {
  return (
    <div>
      <label
        htmlFor={id}
        className="flex min-h-12 cursor-pointer items-center gap-3 rounded-lg border border-line px-3 py-2 text-base text-ink focus-within:ring-2 focus-within:ring-lagoon-200"
      >
        <input id={id} type="checkbox" className="h-6 w-6 shrink-0 accent-lagoon-700" aria-invalid={!!error} aria-describedby={error ? `${id}-error` : undefined} {...input} />
        <span>{label}</span>
      </label>
      {error && (
        <p id={`${id}-error`} role="alert" className="mt-1 text-xs font-medium text-danger-700">
          {error}
        </p>
      )}
    </div>
  );
}
