"use client";

import { Ruler } from "lucide-react";
import { useId, useMemo, useState } from "react";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import {
  DEFAULT_POUCH_RULES,
  DEFAULT_POUCH_SIZES,
  MIN_SEAL_WIDTH_MM,
  type PouchAdvice,
  PouchInputError,
  type PouchSize,
  pouchText,
  recommendPouch,
} from "@/lib/packing/pouch";

export interface PouchChoice {
  inner: PouchSize;
  outer: PouchSize | null;
}

const keyOf = (p: PouchSize) => `${p.widthMm}x${p.lengthMm}`;
const sizeOf = (key: string) => DEFAULT_POUCH_SIZES.find((p) => keyOf(p) === key) ?? null;

function readMm(text: string): number | undefined {
  const value = text.trim().replace(",", ".");
  if (value === "") return undefined;
  const n = Number(value);
  return Number.isFinite(n) ? n : Number.NaN;
}

/**
 * The pouch size helper for single and double pouches: the packer enters the instrument's size,
 * the helper names the smallest pouch (or pair) from the list with its reasons, and the pouch
 * used is recorded with the pack.
 */
export function PouchHelper({
  double,
  value,
  onChange,
  error,
  disabled,
}: {
  double: boolean;
  value: PouchChoice | null;
  onChange: (choice: PouchChoice | null) => void;
  error?: string;
  disabled?: boolean;
}) {
  const id = useId();
  const [length, setLength] = useState("");
  const [width, setWidth] = useState("");
  const [thickness, setThickness] = useState("");
  const [seal, setSeal] = useState(String(DEFAULT_POUCH_RULES.sealWidthMm));

  const outcome = useMemo((): { advice: PouchAdvice } | { field: string; message: string } | null => {
    const lengthMm = readMm(length);
    const widthMm = readMm(width);
    if (lengthMm === undefined || widthMm === undefined) return null;
    try {
      return {
        advice: recommendPouch(
          { lengthMm, widthMm, thicknessMm: readMm(thickness) ?? 0 },
          { double, rules: { sealWidthMm: readMm(seal) ?? DEFAULT_POUCH_RULES.sealWidthMm } },
        ),
      };
    } catch (e) {
      if (e instanceof PouchInputError) return { field: e.field, message: e.message };
      throw e;
    }
  }, [length, width, thickness, seal, double]);

  const fieldError = (field: string) => (outcome && "field" in outcome && outcome.field === field ? outcome.message : undefined);
  const advice = outcome && "advice" in outcome ? outcome.advice : null;

  const useAdvice = () => {
    if (!advice?.ok || !advice.pouch) return;
    onChange({ inner: advice.pouch.pouch, outer: advice.outer?.pouch ?? null });
  };

  return (
    <section aria-labelledby={`${id}-title`} className="space-y-4 rounded-card border border-line bg-paper/60 p-4" data-testid="pouch-helper">
      <h3 id={`${id}-title`} className="flex items-center gap-2 text-base font-semibold text-ink">
        <Ruler className="h-5 w-5 text-lagoon-700" aria-hidden="true" />
        Pouch size{double ? "s (inner and outer)" : ""}
      </h3>
      <div className="grid grid-cols-2 gap-3 sm:grid-cols-4">
        <Field id={`${id}-length`} label="Length (mm)" error={fieldError("lengthMm")}>
          <Input id={`${id}-length`} inputMode="decimal" value={length} onChange={(e) => setLength(e.target.value)} disabled={disabled} className="h-12 text-base" />
        </Field>
        <Field id={`${id}-width`} label="Width (mm)" error={fieldError("widthMm")}>
          <Input id={`${id}-width`} inputMode="decimal" value={width} onChange={(e) => setWidth(e.target.value)} disabled={disabled} className="h-12 text-base" />
        </Field>
        <Field id={`${id}-thickness`} label="Thickness (mm)" hint="Optional" error={fieldError("thicknessMm")}>
          <Input
            id={`${id}-thickness`}
            inputMode="decimal"
            value={thickness}
            onChange={(e) => setThickness(e.target.value)}
            disabled={disabled}
            className="h-12 text-base"
          />
        </Field>
        <Field id={`${id}-seal`} label="Seal width (mm)" hint={`At least ${MIN_SEAL_WIDTH_MM}`} error={fieldError("sealWidthMm")}>
          <Input id={`${id}-seal`} inputMode="decimal" value={seal} onChange={(e) => setSeal(e.target.value)} disabled={disabled} className="h-12 text-base" />
        </Field>
      </div>

      {advice && (
        <div
          role="status"
          data-testid="pouch-advice"
          className={advice.ok ? "rounded-lg border border-lagoon-200 bg-surface p-3" : "rounded-lg border border-warn-600/30 bg-warn-50 p-3 text-warn-700"}
        >
          <ul className="space-y-1 text-sm">
            {advice.explanation.map((line, index) => (
              <li key={index} className={index === 0 ? "text-base font-semibold" : undefined}>
                {line}
              </li>
            ))}
          </ul>
          {advice.ok && (
            <Button variant="secondary" size="lg" className="mt-3" onClick={useAdvice} disabled={disabled}>
              Use {advice.outer ? `${pouchText(advice.pouch!.pouch)} in ${pouchText(advice.outer.pouch)}` : pouchText(advice.pouch!.pouch)}
            </Button>
          )}
        </div>
      )}

      <div className="grid gap-3 sm:grid-cols-2">
        <Field id={`${id}-inner`} label={double ? "Inner pouch used" : "Pouch used"} error={error}>
          <Select
            id={`${id}-inner`}
            className="h-12 text-base"
            value={value ? keyOf(value.inner) : ""}
            disabled={disabled}
            onChange={(e) => {
              const inner = sizeOf(e.target.value);
              onChange(inner ? { inner, outer: double ? (value?.outer ?? null) : null } : null);
            }}
          >
            <option value="">Not recorded</option>
            {DEFAULT_POUCH_SIZES.map((p) => (
              <option key={keyOf(p)} value={keyOf(p)}>
                {pouchText(p)}
              </option>
            ))}
          </Select>
        </Field>
        {double && (
          <Field id={`${id}-outer`} label="Outer pouch used">
            <Select
              id={`${id}-outer`}
              className="h-12 text-base"
              value={value?.outer ? keyOf(value.outer) : ""}
              disabled={disabled || !value}
              onChange={(e) => value && onChange({ inner: value.inner, outer: sizeOf(e.target.value) })}
            >
              <option value="">Choose the outer pouch</option>
              {DEFAULT_POUCH_SIZES.map((p) => (
                <option key={keyOf(p)} value={keyOf(p)}>
                  {pouchText(p)}
                </option>
              ))}
            </Select>
          </Field>
        )}
      </div>
      <p className="text-xs text-muted">
        Advisory: at most three quarters of the inner length filled (ISO/TS 16775), about 2 cm clear round the instrument, seals of at least 6 mm
        (EN 868-5). The sizes listed are common flat-pouch sizes; the pouch maker&apos;s instructions and the unit&apos;s validated packing procedure
        decide.
      </p>
    </section>
  );
}
