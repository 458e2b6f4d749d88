"use client";

import { ArrowDownToLine, Flame } from "lucide-react";
import { type FormEvent, useState } from "react";
import { RunStation } from "@/components/stations/run-station";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input, Select } from "@/components/ui/input";
import { cn } from "@/lib/cn";
import type { LoadView, ScannedIntoLoad, SteriliserOption } from "@/lib/sterilising/loads";
import { LoadStatusBadge } from "./load-status-badge";
import { ReleaseAdvisory } from "./release-advisory";

// The sterilising station: choose a steriliser and its program (or continue its open load), scan
// the packed sets into the load, start it once the day's air-removal test has passed, then finish
// it with the steriliser's record and the indicator results — or abort it after a fault. The flow
// is the shared batch-style station (components/stations/run-station.tsx); what is the
// steriliser's own is here: the day's test, capacity, where each set goes, implants, the
// indicators, and the release that follows.

export function SterilisingStation({ initialSterilisers }: { initialSterilisers: SteriliserOption[] }) {
  return (
    <RunStation<"load", "steriliser", SteriliserOption, LoadView, ScannedIntoLoad>
      noun="load"
      machineNoun="steriliser"
      initialMachines={initialSterilisers}
      machinesUrl="/api/stations/sterilising"
      runsUrl="/api/stations/sterilising/loads"
      finishPath="finish"
      recordHref={(id) => `/unit/loads/${id}`}
      openRunOf={(m) => m.openLoad}
      statusBadge={(status) => <LoadStatusBadge status={status} />}
      picker={{
        icon: Flame,
        gridClassName: "sm:grid-cols-2",
        emptyText: "No steam steriliser is switched on. Add or switch one on under Machines.",
        nameSuffix: (m) => (m.capacityStu !== null ? ` · ${m.capacityStu} StU` : ""),
        details: (m) => (
          <span>
            <AirTestBadge result={m.airRemovalToday} />
          </span>
        ),
        testIdOf: (m) => `steriliser-${m.code}`,
      }}
      machineNote={(m) => <AirTestBadge result={m.airRemovalToday} />}
      openDescription="Choose the cycle the steriliser will run; the record is checked against it."
      noProgramText={(m) => `${m.code} has no active steam program. Add one on the machine's page.`}
      summaryNote={(load) =>
        load.containsImplant && (
          <p className="mt-2">
            <Badge tone="warn">Holds implants: a biological indicator goes in this load</Badge>
          </p>
        )
      }
      scannedHints={(set) => (
        <>
          <p className={cn("flex items-center gap-2 text-lg", set.shelf === "lower" ? "font-semibold text-warn-700" : "text-ink-soft")} data-testid="placement-hint">
            {set.shelf === "lower" && <ArrowDownToLine className="h-5 w-5" aria-hidden="true" />}
            {set.placement}
          </p>
          {set.containsImplant && <Badge tone="warn">Implant set: put a biological indicator in this load</Badge>}
        </>
      )}
      scannedNextText="Next: scan the next set, or start the load when the chamber is full."
      result={(load) => (
        <CardBody className="space-y-3">
          <p className="text-lg" data-testid="load-result">
            {load.status === "awaiting_release"
              ? load.recordPassed
                ? "✓ The record meets the cycle's requirements. The load now waits for the quality lead's release."
                : "✕ The record does not meet the cycle's requirements; the quality lead will decide."
              : load.statusLabel}
          </p>
          {load.reasons.length > 0 && (
            <ul className="list-disc pl-5 text-base text-danger-700">
              {load.reasons.map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          )}
          <ReleaseAdvisory />
        </CardBody>
      )}
      emptyItemsText="No sets yet. Scan each packed set as it goes onto the loading cart."
      itemDetailSuffix={(i) => ` · ${i.placement}`}
      itemBadges={(i) => (
        <>
          {i.shelf === "lower" && <Badge tone="warn">Lower shelf</Badge>}
          <Badge tone={i.state === "sterilised" || i.state === "released" ? "ok" : "neutral"}>{i.stateLabel}</Badge>
        </>
      )}
      finishForm={({ run, busy, problems, onFinish }) => <FinishForm busy={busy} problems={problems} implant={run.containsImplant} onSubmit={onFinish} />}
    />
  );
}

function AirTestBadge({ result }: { result: "pass" | "fail" | null }) {
  if (result === "pass") return <Badge tone="ok">Air-removal test passed today</Badge>;
  if (result === "fail") return <Badge tone="danger">Air-removal test failed today</Badge>;
  return <Badge tone="warn">No air-removal test today</Badge>;
}

const MAX_BYTES = 5 * 1024 * 1024;

function FinishForm({ busy, problems, implant, onSubmit }: { busy: boolean; problems: string[]; implant: boolean; onSubmit: (body: Record<string, unknown>) => void }) {
  const [file, setFile] = useState<File | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [ciType, setCiType] = useState("4");
  const [ciResult, setCiResult] = useState<"" | "pass" | "fail">("");
  const [biResult, setBiResult] = useState<"" | "pending" | "pass" | "not_used">(implant ? "pending" : "not_used");
  const [biLot, setBiLot] = useState("");
  const submit = async (event: FormEvent) => {
    event.preventDefault();
    setError(null);
    if (!file) return setError("Choose the record file the steriliser exported.");
    if (file.size > MAX_BYTES) return setError("The file is too large: at most 5 MB.");
    if (!ciResult) return setError("Record the chemical indicator: changed as expected, or not.");
    onSubmit({ record: { fileName: file.name, text: await file.text() }, ciType: Number(ciType), ciResult, biResult, biLot: biLot || undefined });
  };
  return (
    <Card>
      <CardHeader title="Finish with the record" description="When the steriliser has finished: its time, temperature and pressure record and the indicators." />
      <CardBody>
        <form onSubmit={submit} className="space-y-4" noValidate>
          <Field id="load-record" label="Steriliser record (CSV)" hint="Time, temperature and chamber pressure, with the units in the header.">
            <Input id="load-record" type="file" accept=".csv,text/csv" className="h-14 text-base" onChange={(e) => setFile(e.target.files?.[0] ?? null)} />
          </Field>
          <div className="grid gap-4 sm:grid-cols-2">
            <Field id="ci-type" label="Chemical indicator type (ISO 11140-1)">
              <Select id="ci-type" value={ciType} onChange={(e) => setCiType(e.target.value)} className="h-14 text-base">
                {[1, 3, 4, 5, 6].map((n) => (
                  <option key={n} value={n}>
                    Type {n}
                  </option>
                ))}
              </Select>
            </Field>
            <fieldset className="space-y-1.5">
              <legend className="text-sm font-medium text-ink">Chemical indicator</legend>
              <div className="flex gap-3">
                {(
                  [
                    ["pass", "Changed as expected"],
                    ["fail", "Did not change"],
                  ] as const
                ).map(([value, label]) => (
                  <label key={value} className={cn("flex h-14 flex-1 cursor-pointer items-center justify-center rounded-lg border-2 px-3 text-base", ciResult === value ? "border-lagoon-700 bg-lagoon-50" : "border-line-strong")}>
                    <input type="radio" name="ci-result" value={value} checked={ciResult === value} onChange={() => setCiResult(value)} className="sr-only" />
                    {label}
                  </label>
                ))}
              </div>
            </fieldset>
          </div>
          <div className="grid gap-4 sm:grid-cols-2">
            <Field id="bi-result" label="Biological indicator" hint={implant ? "Required: this load holds implants." : undefined}>
              <Select id="bi-result" value={biResult} onChange={(e) => setBiResult(e.target.value as typeof biResult)} className="h-14 text-base">
                {!implant && <option value="not_used">None in this load</option>}
                <option value="pending">In the load, incubating</option>
                <option value="pass">Read: no growth</option>
              </Select>
            </Field>
            <Field id="bi-lot" label="Indicator lot (optional)">
              <Input id="bi-lot" value={biLot} onChange={(e) => setBiLot(e.target.value)} className="h-14 text-base" />
            </Field>
          </div>
          {(error || problems.length > 0) && (
            <div role="alert" className="rounded-lg border-2 border-danger-600 bg-danger-50 p-4 text-danger-700" data-testid="record-problems">
              {error && <p className="text-base font-semibold">{error}</p>}
              {problems.length > 0 && (
                <>
                  <p className="text-base font-semibold">The record could not be read; nothing was saved:</p>
                  <ul className="list-disc pl-5 text-base">
                    {problems.map((p) => (
                      <li key={p}>{p}</li>
                    ))}
                  </ul>
                </>
              )}
            </div>
          )}
          <Button type="submit" size="lg" variant="accent" disabled={busy}>
            {busy ? "Checking…" : "Finish the load"}
          </Button>
          <ReleaseAdvisory />
        </form>
      </CardBody>
    </Card>
  );
}
