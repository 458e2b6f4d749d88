"use client";

import { CircleCheck, Hand } from "lucide-react";
import { useState } from "react";
import { toast } from "sonner";
import { ProcessingNotes } from "@/components/stations/processing-notes";
import { ScanField } from "@/components/stations/scan-field";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { cn } from "@/lib/cn";
import type { ManualWashStep } from "@/lib/washing/checklist";
import type { ManualWashSet } from "@/lib/washing/manual";
import { newClientEventId, postJson } from "@/components/stations/post";
import { Refusal } from "./refusal";

// The manual-washing station: scan a set waiting to be washed, confirm each step of washing it
// by hand, and record the wash; the operator is the signed-in technician.

const focusScan = () => setTimeout(() => document.getElementById("station-scan")?.focus(), 30);

interface Done {
  serial: string;
  stateLabel: string;
}

export function ManualWashingStation({ operator }: { operator: string }) {
  const [set, setSet] = useState<ManualWashSet | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [done, setDone] = useState<Done | null>(null);
  const [busy, setBusy] = useState(false);

  const onScan = async (code: string) => {
    setBusy(true);
    setRefusal(null);
    setDone(null);
    const res = await postJson<{ set: ManualWashSet }>("/api/stations/manual-washing/scan", { code });
    setBusy(false);
    if (!res.ok) {
      setSet(null);
      setRefusal(res.message);
      return;
    }
    setSet(res.data.set);
  };

  return (
    <div className="space-y-6">
      <ScanField onScan={onScan} busy={busy} label="Wash by hand" />
      {refusal && <Refusal title="Not now" message={refusal} />}
      {done && (
        <div role="status" data-testid="manual-wash-done" className="rounded-card border-2 border-ok-600 bg-ok-50 p-6 text-ok-700">
          <p className="flex items-center gap-3 text-2xl font-semibold">
            <CircleCheck className="h-8 w-8" aria-hidden="true" />✓ {done.serial} recorded as washed by hand
          </p>
          <p className="mt-2 text-lg">Now: {done.stateLabel}. Next: inspection and packing.</p>
        </div>
      )}
      {set ? (
        <Checklist
          key={set.cycleId}
          set={set}
          operator={operator}
          onDone={(d) => {
            setSet(null);
            setDone(d);
            toast.success(`${d.serial} washed by hand`);
            focusScan();
          }}
          onRefused={setRefusal}
        />
      ) : (
        !refusal &&
        !done && (
          <Card>
            <CardBody className="py-10 text-center text-lg text-muted">
              <Hand className="mx-auto mb-3 h-10 w-10 text-lagoon-600" aria-hidden="true" />
              Scan a set that is received or back for washing. The station lists the steps its set type needs.
            </CardBody>
          </Card>
        )
      )}
      <p className="text-xs text-muted">
        The checklist records what the operator confirms; it does not replace the set&apos;s instructions for use, the unit&apos;s validated manual cleaning and
        disinfection procedure, or the judgement of qualified staff.
      </p>
    </div>
  );
}

function Checklist({
  set,
  operator,
  onDone,
  onRefused,
}: {
  set: ManualWashSet;
  operator: string;
  onDone: (d: Done) => void;
  onRefused: (message: string) => void;
}) {
  const [checks, setChecks] = useState<Partial<Record<ManualWashStep, boolean>>>({});
  const [busy, setBusy] = useState(false);
  const [fieldErrors, setFieldErrors] = useState<Record<string, string[]>>({});
  const all = set.steps.every((s) => checks[s.step]);
  const [eventId] = useState(newClientEventId);

  const confirm = async () => {
    setBusy(true);
    setFieldErrors({});
    const res = await postJson<{ serial: string; stateLabel: string }>("/api/stations/manual-washing/confirm", { cycleId: set.cycleId, checks, clientEventId: eventId });
    setBusy(false);
    if (res.ok) return onDone(res.data);
    setFieldErrors(res.fields);
    if (Object.keys(res.fields).length === 0) onRefused(res.message);
  };

  return (
    <Card data-testid="manual-wash-set">
      <CardHeader title={`${set.serial} · ${set.setTypeName}`} description={`${set.organisationName} · ${set.homeSiteName} · ${set.stateLabel}`} />
      <CardBody className="space-y-5">
        <ProcessingNotes typeName={set.setTypeName} flags={set.flags} notes={set.processingNotes} ifuFileId={set.ifuFileId} />
        <fieldset className="space-y-3">
          <legend className="mb-2 text-lg font-semibold text-ink">Confirm each step as it is done</legend>
          {set.steps.map(({ step, label }) => {
            const error = fieldErrors[`checks.${step}`]?.[0];
            return (
              <div key={step}>
                <label
                  className={cn(
                    "flex min-h-14 cursor-pointer items-center gap-4 rounded-lg border-2 px-4 py-3 text-lg focus-within:ring-4 focus-within:ring-lagoon-200",
                    checks[step] ? "border-ok-600 bg-ok-50" : error ? "border-danger-600" : "border-line-strong bg-surface",
                  )}
                >
                  <input
                    type="checkbox"
                    className="h-7 w-7 accent-lagoon-700"
                    checked={!!checks[step]}
                    onChange={(e) => setChecks((c) => ({ ...c, [step]: e.target.checked }))}
                    aria-invalid={!!error}
                  />
                  <span>{label}</span>
                </label>
                {error && (
                  <p role="alert" className="mt-1 text-sm font-medium text-danger-700">
                    {error}
                  </p>
                )}
              </div>
            );
          })}
        </fieldset>
        <p className="text-base text-muted">
          Operator: <span className="font-medium text-ink">{operator}</span>
        </p>
        <Button size="lg" variant="accent" onClick={confirm} disabled={busy || !all} className="w-full sm:w-auto">
          {busy ? "Recording…" : "Record the manual wash"}
        </Button>
        {!all && <p className="text-sm text-muted">Tick every step to record the wash.</p>}
      </CardBody>
    </Card>
  );
}
