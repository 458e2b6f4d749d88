"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { toast } from "sonner";
import { FormError } from "@/components/forms/form-error";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import { formatDateTime } from "@/lib/format";
import { requestFromStoreAction } from "@/lib/orders/actions";
import type { StoredSet } from "@/lib/orders/store-requests";

/** Choose sets kept in the unit's store and ask for them to be delivered. */
export function StoreRequestForm({ sets, defaultNeededBy, timeZone }: { sets: StoredSet[]; defaultNeededBy: string; timeZone: string }) {
  const router = useRouter();
  const sites = [...new Map(sets.map((s) => [s.siteId, s.siteName])).entries()];
  const [siteId, setSiteId] = useState(sites[0]?.[0] ?? 0);
  const [chosen, setChosen] = useState<number[]>([]);
  const [neededBy, setNeededBy] = useState(defaultNeededBy);
  const [notes, setNotes] = useState("");
  const [error, setError] = useState<string | null>(null);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [pending, start] = useTransition();
  const shown = sets.filter((s) => s.siteId === siteId);

  const submit = () =>
    start(async () => {
      setError(null);
      const result = await requestFromStoreAction({ siteId, cycleIds: chosen, neededBy, notes });
      if (!result.ok) {
        setError(result.error.message);
        setFields(result.error.fields ?? {});
        return;
      }
      toast.success(`${result.data.reference}: the sets come on the next delivery`);
      router.push(`/clinic/orders/${result.data.orderId}`);
    });

  if (sets.length === 0) return <p className="text-sm text-muted">The unit holds none of your sets in its store right now.</p>;
  return (
    <div className="space-y-4">
      <FormError message={error} />
      {sites.length > 1 && (
        <Field id="store-site" label="Deliver to">
          <Select id="store-site" value={siteId} onChange={(e) => { setSiteId(Number(e.target.value)); setChosen([]); }}>
            {sites.map(([id, name]) => (
              <option key={id} value={id}>
                {name}
              </option>
            ))}
          </Select>
        </Field>
      )}
      <fieldset>
        <legend className="mb-2 text-sm font-medium">Sets in the store</legend>
        <ul className="divide-y divide-line rounded-lg border border-line">
          {shown.map((s) => (
            <li key={s.cycleId}>
              <label className="flex cursor-pointer items-center gap-3 px-3 py-2 text-sm hover:bg-paper">
                <input
                  type="checkbox"
                  className="h-5 w-5 accent-lagoon-700"
                  checked={chosen.includes(s.cycleId)}
                  onChange={(e) => setChosen(e.target.checked ? [...chosen, s.cycleId] : chosen.filter((c) => c !== s.cycleId))}
                />
                <span className="flex-1">
                  <span className="font-medium">{s.name}</span> <span className="text-muted">{s.serial}</span>
                </span>
                <span className="text-xs text-muted">released {formatDateTime(s.releasedAt, timeZone)}</span>
              </label>
            </li>
          ))}
        </ul>
        {fields.cycleIds?.map((m) => (
          <p key={m} role="alert" className="mt-1 text-xs font-medium text-danger-700">
            {m}
          </p>
        ))}
      </fieldset>
      <Field id="store-needed" label="Needed by" error={fields.neededBy?.[0]}>
        <Input id="store-needed" type="datetime-local" value={neededBy} onChange={(e) => setNeededBy(e.target.value)} />
      </Field>
      <Field id="store-notes" label="Notes for the unit (optional)">
        <Textarea id="store-notes" value={notes} onChange={(e) => setNotes(e.target.value)} />
      </Field>
      <Button onClick={submit} disabled={pending || chosen.length === 0}>
        Ask for {chosen.length || ""} {chosen.length === 1 ? "set" : "sets"}
      </Button>
    </div>
  );
}
