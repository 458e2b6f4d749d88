"use client";

import { useRouter } from "next/navigation";
import { type FormEvent, useState } from "react";
import { toast } from "sonner";
import { postJson } from "@/components/stations/post";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";

/** Records today's air-removal (Bowie-Dick type) test or vacuum leak test for a steriliser. */
export function MachineTestForm({ sterilisers, leakLimitKpaMin }: { sterilisers: { id: number; code: string; name: string }[]; leakLimitKpaMin: number }) {
  const router = useRouter();
  const [machineId, setMachineId] = useState(String(sterilisers[0]?.id ?? ""));
  const [kind, setKind] = useState<"air_removal" | "leak">("air_removal");
  const [result, setResult] = useState<"" | "pass" | "fail">("");
  const [rate, setRate] = useState("");
  const [notes, setNotes] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setError(null);
    if (kind === "air_removal" && !result) return setError("Choose whether the test sheet showed a pass or a fail.");
    setBusy(true);
    const res = await postJson<{ test: { result: string } }>("/api/sterilisers/tests", {
      machineId: Number(machineId),
      kind,
      result: kind === "air_removal" ? result : undefined,
      leakRateKpaMin: kind === "leak" ? (rate.trim() === "" ? null : Number(rate.replace(",", "."))) : undefined,
      notes: notes || null,
    });
    setBusy(false);
    if (!res.ok) return setError(Object.values(res.fields)[0]?.[0] ?? res.message);
    toast.success(`Test recorded: ${res.data.test.result === "pass" ? "passed" : "failed"}`);
    setResult("");
    setRate("");
    setNotes("");
    router.refresh();
  };
  return (
    <form onSubmit={submit} className="space-y-4" noValidate>
      <div className="grid gap-4 sm:grid-cols-2">
        <Field id="test-machine" label="Steriliser">
          <Select id="test-machine" value={machineId} onChange={(e) => setMachineId(e.target.value)} className="h-12">
            {sterilisers.map((m) => (
              <option key={m.id} value={m.id}>
                {m.code} · {m.name}
              </option>
            ))}
          </Select>
        </Field>
        <Field id="test-kind" label="Test">
          <Select id="test-kind" value={kind} onChange={(e) => setKind(e.target.value as typeof kind)} className="h-12">
            <option value="air_removal">Air-removal (Bowie-Dick type) test</option>
            <option value="leak">Vacuum leak test</option>
          </Select>
        </Field>
      </div>
      {kind === "air_removal" ? (
        <fieldset className="space-y-1.5">
          <legend className="text-sm font-medium text-ink">Result of the test sheet</legend>
          <div className="flex gap-3">
            {(
              [
                ["pass", "Passed (uniform change)"],
                ["fail", "Failed"],
              ] as const
            ).map(([value, label]) => (
              <label key={value} className={`flex h-12 flex-1 cursor-pointer items-center justify-center rounded-lg border-2 px-3 ${result === value ? "border-lagoon-700 bg-lagoon-50" : "border-line-strong"}`}>
                <input type="radio" name="test-result" value={value} checked={result === value} onChange={() => setResult(value)} className="sr-only" />
                {label}
              </label>
            ))}
          </div>
        </fieldset>
      ) : (
        <Field id="test-rate" label="Measured leak rate (kPa/min)" hint={`Limit ${leakLimitKpaMin} kPa/min (${(leakLimitKpaMin * 10).toFixed(1)} mbar/min); judged automatically.`}>
          <Input id="test-rate" inputMode="decimal" value={rate} onChange={(e) => setRate(e.target.value)} className="h-12" />
        </Field>
      )}
      <Field id="test-notes" label="Notes (optional)">
        <Textarea id="test-notes" value={notes} onChange={(e) => setNotes(e.target.value)} />
      </Field>
      {error && (
        <p role="alert" className="text-sm font-medium text-danger-700">
          {error}
        </p>
      )}
      <Button type="submit" size="lg" disabled={busy}>
        {busy ? "Recording…" : "Record the test"}
      </Button>
    </form>
  );
}
