"use client";

import { useRouter } from "next/navigation";
import { type FormEvent, useState } from "react";
import { toast } from "sonner";
import { postJson } from "@/components/stations/post";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { SHELF_LIFE_UNITS, type ShelfLifeRule, STORAGE_LABELS } from "@/lib/sterilising/shelf-life";

/** The quality lead's settings: shelf-life rules by packaging and storage, the leak limit, the heavy-set threshold. */
export function SterileSettingsForm({
  rules: initialRules,
  packagingLabels,
  leakLimitKpaMin,
  heavySetThresholdG,
}: {
  rules: ShelfLifeRule[];
  packagingLabels: Record<string, string>;
  leakLimitKpaMin: number;
  heavySetThresholdG: number;
}) {
  const router = useRouter();
  const [rules, setRules] = useState(initialRules.map((r) => ({ ...r, amount: String(r.amount) })));
  const [leak, setLeak] = useState(String(leakLimitKpaMin));
  const [heavy, setHeavy] = useState(String(heavySetThresholdG));
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setBusy(true);
    setError(null);
    const res = await postJson("/api/sterile-settings", {
      leakLimitKpaMin: Number(leak.replace(",", ".")),
      heavySetThresholdG: Number(heavy),
      rules: rules.map((r) => ({ ...r, amount: Number(r.amount) })),
    });
    setBusy(false);
    if (!res.ok) return setError(`${res.message} ${Object.entries(res.fields).map(([k, v]) => `${k}: ${v.join(" ")}`).join("; ")}`);
    toast.success("Settings saved");
    router.refresh();
  };
  return (
    <form onSubmit={submit} className="space-y-6" noValidate>
      <table className="w-full text-left text-sm">
        <thead className="text-xs uppercase text-muted">
          <tr>
            <th className="py-2 pr-3 font-medium">Packaging</th>
            <th className="py-2 pr-3 font-medium">Storage at the site</th>
            <th className="py-2 font-medium">Shelf life</th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {rules.map((r, i) => (
            <tr key={`${r.packaging}-${r.storage}`}>
              <td className="py-2 pr-3">{packagingLabels[r.packaging] ?? r.packaging}</td>
              <td className="py-2 pr-3">{STORAGE_LABELS[r.storage]}</td>
              <td className="flex gap-2 py-2">
                <Input
                  aria-label={`Shelf life of ${r.packaging} in ${r.storage} storage`}
                  inputMode="numeric"
                  value={r.amount}
                  onChange={(e) => setRules((all) => all.map((x, k) => (k === i ? { ...x, amount: e.target.value } : x)))}
                  className="w-20"
                />
                <Select
                  aria-label="Unit"
                  value={r.unit}
                  onChange={(e) => setRules((all) => all.map((x, k) => (k === i ? { ...x, unit: e.target.value as ShelfLifeRule["unit"] } : x)))}
                  className="w-28"
                >
                  {SHELF_LIFE_UNITS.map((u) => (
                    <option key={u} value={u}>
                      {u}
                    </option>
                  ))}
                </Select>
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="leak-limit" label="Vacuum leak test limit (kPa/min)" hint="Default 0.13 kPa/min = 1.3 mbar/min (EN 285 / HTM 2010).">
          <Input id="leak-limit" inputMode="decimal" value={leak} onChange={(e) => setLeak(e.target.value)} />
        </Field>
        <Field id="heavy-threshold" label="Lower shelf from (g)" hint="Sets at or above this weight are placed on the lower shelf (common practice).">
          <Input id="heavy-threshold" inputMode="numeric" value={heavy} onChange={(e) => setHeavy(e.target.value)} />
        </Field>
      </div>
      {error && (
        <p role="alert" className="text-sm font-medium text-danger-700">
          {error}
        </p>
      )}
      <Button type="submit" disabled={busy}>
        {busy ? "Saving…" : "Save the settings"}
      </Button>
    </form>
  );
}
