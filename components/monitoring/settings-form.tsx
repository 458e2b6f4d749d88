"use client";

import { zodResolver } from "@hookform/resolvers/zod";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { type Resolver, useForm } from "react-hook-form";
import { toast } from "sonner";
import { applyFieldErrors } from "@/components/forms/apply-field-errors";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/input";
import { CHECK_INFO, CHECK_KEYS, type CheckKey, LIMIT_INFO, LIMIT_KEYS, type LimitKey, type MonitoringSettings } from "@/lib/monitoring/limits";
import { saveSettingsAction } from "@/lib/monitoring/actions";
import { type SettingsInput, settingsSchema } from "@/lib/monitoring/schemas";

// The quality lead's limits for each reading and interval of each recurring check.

interface Values {
  limits: Record<LimitKey, { low: string; high: string }>;
  intervals: Record<CheckKey, string>;
}

const text = (v: number | null) => (v === null ? "" : String(v));

function valuesOf(s: MonitoringSettings): Values {
  return {
    limits: Object.fromEntries(LIMIT_KEYS.map((k) => [k, { low: text(s.limits[k].low), high: text(s.limits[k].high) }])) as Values["limits"],
    intervals: Object.fromEntries(CHECK_KEYS.map((k) => [k, String(s.intervals[k])])) as Values["intervals"],
  };
}

export function SettingsForm({ settings }: { settings: MonitoringSettings }) {
  const router = useRouter();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    getValues,
    setError,
    formState: { errors, isSubmitting },
  } = useForm<Values>({ resolver: zodResolver(settingsSchema) as unknown as Resolver<Values>, defaultValues: valuesOf(settings) });

  const onSubmit = async () => {
    setFormError(null);
    const result = await saveSettingsAction(getValues() as unknown as SettingsInput);
    if (!result.ok) {
      applyFieldErrors(result.error.fields, setError);
      setFormError(result.error.message);
      return;
    }
    toast.success("Limits and intervals saved; new entries are checked against them");
    router.refresh();
  };

  return (
    <form onSubmit={handleSubmit(onSubmit)} noValidate className="space-y-5" data-testid="settings-form">
      <FormError message={formError} />
      <fieldset disabled={isSubmitting} className="space-y-5">
        <table className="w-full text-left text-sm">
          <caption className="pb-2 text-left text-xs text-muted">Limits; leave an end empty for no limit on that side.</caption>
          <thead className="text-xs text-muted">
            <tr>
              <th className="py-1 pr-3 font-medium">Reading</th>
              <th className="py-1 pr-3 font-medium">Lowest</th>
              <th className="py-1 pr-3 font-medium">Highest</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {LIMIT_KEYS.map((k) => (
              <tr key={k}>
                <td className="py-2 pr-3">
                  <span className="font-medium text-ink">
                    {LIMIT_INFO[k].label} ({LIMIT_INFO[k].unit})
                  </span>
                  <span className="block text-xs text-muted">Default {LIMIT_INFO[k].source}</span>
                </td>
                {(["low", "high"] as const).map((end) => (
                  <td key={end} className="py-2 pr-3 align-top">
                    <Input
                      aria-label={`${LIMIT_INFO[k].label}, ${end === "low" ? "lowest" : "highest"}`}
                      inputMode="decimal"
                      className="w-24"
                      aria-invalid={!!errors.limits?.[k]?.[end]}
                      {...register(`limits.${k}.${end}`)}
                    />
                    {errors.limits?.[k]?.[end] && (
                      <p role="alert" className="mt-1 text-xs font-medium text-danger-700">
                        {errors.limits[k]?.[end]?.message}
                      </p>
                    )}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
        <table className="w-full text-left text-sm">
          <caption className="pb-2 text-left text-xs text-muted">How often each recurring check is due, in days of the unit&apos;s calendar.</caption>
          <tbody className="divide-y divide-line">
            {CHECK_KEYS.map((k) => (
              <tr key={k}>
                <td className="py-2 pr-3">
                  <span className="font-medium text-ink">{CHECK_INFO[k].label}</span>
                  <span className="block text-xs text-muted">Default {CHECK_INFO[k].source}</span>
                </td>
                <td className="py-2 pr-3 align-top">
                  <Input aria-label={`${CHECK_INFO[k].label}, interval in days`} inputMode="numeric" className="w-20" aria-invalid={!!errors.intervals?.[k]} {...register(`intervals.${k}`)} />
                  {errors.intervals?.[k] && (
                    <p role="alert" className="mt-1 text-xs font-medium text-danger-700">
                      {errors.intervals[k]?.message}
                    </p>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <div className="flex justify-end">
          <Button type="submit">{isSubmitting ? "Saving…" : "Save limits and intervals"}</Button>
        </div>
      </fieldset>
    </form>
  );
}
