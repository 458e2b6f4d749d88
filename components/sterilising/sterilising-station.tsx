"use client";

import { ArrowLeft, ArrowDownToLine, Flame, Layers, Play, Square } from "lucide-react";
import Link from "next/link";
import { type FormEvent, useState } from "react";
import { toast } from "sonner";
import { newClientEventId, postJson } from "@/components/stations/post";
import { ProcessingNotes } from "@/components/stations/processing-notes";
import { ScanField } from "@/components/stations/scan-field";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Input, Select, Textarea } from "@/components/ui/input";
import { Refusal } from "@/components/washing/refusal";
import { cn } from "@/lib/cn";
import { fetchJson } from "@/lib/fetch-json";
import { formatDateTime } from "@/lib/format";
import type { LoadView, ScannedIntoLoad, SteriliserOption } from "@/lib/sterilising/loads";
import { LoadStatusBadge } from "./load-status-badge";
import { ReleaseAdvisory } from "./release-advisory";

// The sterilising station: choose a steriliser and its program (or continue its open load), scan
// the packed sets into the load, start it once the day's air-removal test has passed, then finish
// it with the steriliser's record and the indicator results — or abort it after a fault.

const focusScan = () => setTimeout(() => document.getElementById("station-scan")?.focus(), 30);

export function SterilisingStation({ initialSterilisers }: { initialSterilisers: SteriliserOption[] }) {
  const [sterilisers, setSterilisers] = useState(initialSterilisers);
  const [machineId, setMachineId] = useState<number | null>(null);
  const [load, setLoad] = useState<LoadView | null>(null);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const machine = sterilisers.find((m) => m.id === machineId) ?? null;

  const refresh = async () => {
    try {
      setSterilisers((await fetchJson<{ sterilisers: SteriliserOption[] }>("/api/stations/sterilising")).sterilisers);
    } catch {
      // The list refreshes on the next visit; the load on screen is already current.
    }
  };

  const choose = async (m: SteriliserOption) => {
    setRefusal(null);
    setMachineId(m.id);
    setLoad(null);
    if (!m.openLoad) return;
    setBusy(true);
    try {
      setLoad((await fetchJson<{ load: LoadView }>(`/api/stations/sterilising/loads/${m.openLoad.id}`)).load);
      focusScan();
    } catch (error) {
      setRefusal(error instanceof Error ? error.message : "The load could not be loaded.");
    } finally {
      setBusy(false);
    }
  };

  const back = async () => {
    setMachineId(null);
    setLoad(null);
    setRefusal(null);
    await refresh();
  };

  if (!machine) return <SteriliserPicker sterilisers={sterilisers} onChoose={choose} busy={busy} />;
  return (
    <div className="space-y-6">
      <div className="flex flex-wrap items-center justify-between gap-3">
        <Button variant="secondary" size="lg" onClick={back}>
          <ArrowLeft className="h-5 w-5" aria-hidden="true" /> All sterilisers
        </Button>
        <p className="text-lg font-semibold text-ink">
          {machine.code} · {machine.name} <AirTestBadge result={machine.airRemovalToday} />
        </p>
      </div>
      {refusal && !load && <Refusal title="Not possible" message={refusal} />}
      {load ? (
        <LoadPanel
          key={load.id}
          load={load}
          onChange={async (next) => {
            setLoad(next);
            if (next.status !== "loading") await refresh();
          }}
          onNext={async () => {
            setLoad(null);
            await refresh();
          }}
        />
      ) : (
        <OpenLoad
          machine={machine}
          onOpened={async (opened) => {
            setRefusal(null);
            setLoad(opened);
            await refresh();
            focusScan();
          }}
          onRefused={setRefusal}
        />
      )}
    </div>
  );
}

function AirTestBadge({ result }: { result: "pass" | "fail" | null }) {
  if (result === "pass") return <Badge tone="ok">Air-removal test passed today</Badge>;
  if (result === "fail") return <Badge tone="danger">Air-removal test failed today</Badge>;
  return <Badge tone="warn">No air-removal test today</Badge>;
}

function SteriliserPicker({ sterilisers, onChoose, busy }: { sterilisers: SteriliserOption[]; onChoose: (m: SteriliserOption) => void; busy: boolean }) {
  if (sterilisers.length === 0) {
    return (
      <Card>
        <CardBody className="py-10 text-center text-lg text-muted">No steam steriliser is switched on. Add or switch one on under Machines.</CardBody>
      </Card>
    );
  }
  return (
    <section aria-labelledby="sterilisers-heading" className="space-y-3">
      <h2 id="sterilisers-heading" className="text-lg font-semibold text-ink">
        Choose the steriliser
      </h2>
      <ul className="grid gap-4 sm:grid-cols-2">
        {sterilisers.map((m) => (
          <li key={m.id}>
            <button
              type="button"
              disabled={busy}
              onClick={() => onChoose(m)}
              data-testid={`steriliser-${m.code}`}
              className="flex h-full min-h-36 w-full flex-col gap-2 rounded-card border border-line bg-surface p-5 text-left shadow-card transition-colors hover:border-lagoon-400 hover:bg-lagoon-50 focus-visible:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200"
            >
              <span className="flex items-center gap-3 text-2xl font-semibold text-ink">
                <Flame className="h-8 w-8 text-lagoon-700" aria-hidden="true" />
                {m.code}
              </span>
              <span className="text-base text-ink-soft">
                {m.name}
                {m.capacityStu !== null ? ` · ${m.capacityStu} StU` : ""}
              </span>
              <span>
                <AirTestBadge result={m.airRemovalToday} />
              </span>
              {m.openLoad ? (
                <span className="mt-auto text-base">
                  <LoadStatusBadge status={m.openLoad.status} /> Load {m.openLoad.number} · {m.openLoad.itemCount} set{m.openLoad.itemCount === 1 ? "" : "s"}
                </span>
              ) : (
                <span className="mt-auto text-base text-muted">Free: open a new load</span>
              )}
            </button>
          </li>
        ))}
      </ul>
    </section>
  );
}

function OpenLoad({ machine, onOpened, onRefused }: { machine: SteriliserOption; onOpened: (l: LoadView) => void; onRefused: (message: string) => void }) {
  const [programId, setProgramId] = useState<number | null>(machine.programs[0]?.id ?? null);
  const [busy, setBusy] = useState(false);
  const open = async () => {
    if (!programId) return;
    setBusy(true);
    const res = await postJson<{ load: LoadView }>("/api/stations/sterilising/loads", { machineId: machine.id, programId });
    setBusy(false);
    if (res.ok) onOpened(res.data.load);
    else onRefused(res.message);
  };
  if (machine.programs.length === 0) {
    return <Refusal title="No program" message={`${machine.code} has no active steam program. Add one on the machine's page.`} />;
  }
  return (
    <Card>
      <CardHeader title="Open a load" description="Choose the cycle the steriliser will run; the record is checked against it." />
      <CardBody className="space-y-4">
        <div role="radiogroup" aria-label="Program" className="grid gap-3 sm:grid-cols-2">
          {machine.programs.map((p) => (
            <button
              key={p.id}
              type="button"
              role="radio"
              aria-checked={programId === p.id}
              onClick={() => setProgramId(p.id)}
              className={cn(
                "rounded-lg border-2 p-4 text-left focus-visible:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200",
                programId === p.id ? "border-lagoon-700 bg-lagoon-50" : "border-line-strong bg-surface hover:bg-paper",
              )}
            >
              <span className="block text-lg font-semibold text-ink">{p.name}</span>
              <span className="block text-sm text-muted">{p.requirementText}</span>
            </button>
          ))}
        </div>
        <Button size="lg" onClick={open} disabled={busy || !programId}>
          <Layers className="h-5 w-5" aria-hidden="true" /> {busy ? "Opening…" : `Open a load on ${machine.code}`}
        </Button>
      </CardBody>
    </Card>
  );
}

function LoadPanel({ load, onChange, onNext }: { load: LoadView; onChange: (l: LoadView) => void; onNext: () => void }) {
  const [refusal, setRefusal] = useState<string | null>(null);
  const [scanned, setScanned] = useState<ScannedIntoLoad | null>(null);
  const [problems, setProblems] = useState<string[]>([]);
  const [busy, setBusy] = useState(false);
  const base = `/api/stations/sterilising/loads/${load.id}`;
  const finished = !["loading", "running"].includes(load.status);

  const onScan = async (code: string) => {
    setBusy(true);
    setRefusal(null);
    const res = await postJson<{ load: LoadView; scanned: ScannedIntoLoad; alreadyInLoad: boolean }>(`${base}/scan`, { code });
    setBusy(false);
    if (!res.ok) {
      setScanned(null);
      setRefusal(res.message);
      return;
    }
    setScanned(res.data.scanned);
    onChange(res.data.load);
    if (res.data.alreadyInLoad) toast.info(`${res.data.scanned.serial} is already in this load`);
  };

  const remove = async (cycleId: number, serial: string) => {
    setBusy(true);
    const res = await postJson<{ load: LoadView }>(`${base}/remove`, { cycleId });
    setBusy(false);
    if (!res.ok) return setRefusal(res.message);
    if (scanned?.cycleId === cycleId) setScanned(null);
    onChange(res.data.load);
    toast.success(`${serial} taken out of the load`);
    focusScan();
  };

  const start = async () => {
    setBusy(true);
    setRefusal(null);
    const res = await postJson<{ load: LoadView }>(`${base}/start`);
    setBusy(false);
    if (!res.ok) return setRefusal(res.message);
    setScanned(null);
    onChange(res.data.load);
    toast.success(`Load ${load.number} started`);
  };

  const finish = async (body: Record<string, unknown>) => {
    setBusy(true);
    setRefusal(null);
    setProblems([]);
    const res = await postJson<{ load: LoadView }>(`${base}/finish`, { ...body, clientEventId: newClientEventId() });
    setBusy(false);
    if (!res.ok) {
      if (res.fields.record?.length) setProblems(res.fields.record);
      else setRefusal(res.message);
      return;
    }
    onChange(res.data.load);
  };

  const abort = async (reason: string) => {
    setBusy(true);
    setRefusal(null);
    const res = await postJson<{ load: LoadView }>(`${base}/abort`, { reason, clientEventId: newClientEventId() });
    setBusy(false);
    if (!res.ok) return setRefusal(res.fields.reason?.[0] ?? res.message);
    onChange(res.data.load);
  };

  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="flex flex-wrap items-start justify-between gap-4">
          <div>
            <p className="text-sm text-muted">Load</p>
            <p className="text-3xl font-semibold tracking-tight text-ink" data-testid="load-number">
              {load.number}
            </p>
            <p className="mt-1 text-base text-ink-soft">
              {load.program.name} · <span className="text-muted">{load.program.requirementText}</span>
            </p>
            {load.containsImplant && (
              <p className="mt-2">
                <Badge tone="warn">Holds implants: a biological indicator goes in this load</Badge>
              </p>
            )}
          </div>
          <div className="space-y-1 text-right">
            <p className="text-lg" data-testid="load-status">
              <LoadStatusBadge status={load.status} />
            </p>
            <p className="text-sm text-muted" data-testid="load-stu">
              {load.items.length} set{load.items.length === 1 ? "" : "s"} · {load.loadStu}
              {load.machine.capacityStu !== null ? ` of ${load.machine.capacityStu}` : ""} StU
            </p>
            {load.startedAt && (
              <p className="text-sm text-muted">
                Started {formatDateTime(load.startedAt)}
                {load.startedBy ? ` by ${load.startedBy}` : ""}
              </p>
            )}
          </div>
        </CardBody>
      </Card>

      {load.status === "loading" && (
        <>
          <ScanField onScan={onScan} busy={busy} label="Add to load" />
          {refusal && <Refusal title="Not added" message={refusal} />}
          {scanned && !refusal && <ScannedCard set={scanned} />}
        </>
      )}
      {load.status !== "loading" && refusal && <Refusal title="Not possible" message={refusal} />}

      {finished && (
        <Card>
          <CardHeader title="Result" description={`Checked against: ${load.program.requirementText}`} />
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
        </Card>
      )}

      <LoadItems load={load} busy={busy} onRemove={remove} />

      {load.status === "loading" && (
        <Button size="lg" variant="accent" onClick={start} disabled={busy || load.items.length === 0} className="w-full sm:w-auto">
          <Play className="h-5 w-5" aria-hidden="true" /> Start the load
        </Button>
      )}

      {load.status === "running" && (
        <>
          <FinishForm busy={busy} problems={problems} implant={load.containsImplant} onSubmit={finish} />
          <AbortForm busy={busy} onAbort={abort} />
        </>
      )}

      {finished && (
        <div className="flex flex-wrap gap-3">
          <Button size="lg" onClick={onNext}>
            <Layers className="h-5 w-5" aria-hidden="true" /> Next load
          </Button>
          <Button size="lg" variant="secondary" asChild>
            <Link href={`/unit/loads/${load.id}`}>Open the load record</Link>
          </Button>
        </div>
      )}
    </div>
  );
}

function ScannedCard({ set }: { set: ScannedIntoLoad }) {
  return (
    <Card data-testid="scanned-set">
      <CardBody className="space-y-3">
        <p className="text-sm font-medium text-ok-700">✓ Added to the load</p>
        <p className="text-2xl font-semibold text-ink">
          {set.serial} · {set.setTypeName}
        </p>
        <p className="text-base text-muted">
          {set.organisationName} · {set.homeSiteName} · {set.sizeStu} StU
        </p>
        <p className={cn("flex items-center gap-2 text-lg", set.shelf === "lower" ? "font-semibold text-warn-700" : "text-ink-soft")} data-testid="placement-hint">
          {set.shelf === "lower" && <ArrowDownToLine className="h-5 w-5" aria-hidden="true" />}
          {set.placement}
        </p>
        {set.containsImplant && <Badge tone="warn">Implant set: put a biological indicator in this load</Badge>}
        <ProcessingNotes typeName={set.setTypeName} flags={set.flags} notes={set.processingNotes} ifuFileId={set.ifuFileId} />
        <p className="text-base text-ink-soft">Next: scan the next set, or start the load when the chamber is full.</p>
      </CardBody>
    </Card>
  );
}

function LoadItems({ load, busy, onRemove }: { load: LoadView; busy: boolean; onRemove: (cycleId: number, serial: string) => void }) {
  return (
    <Card>
      <CardHeader title="Sets in the load" />
      {load.items.length === 0 ? (
        <CardBody className="text-base text-muted">No sets yet. Scan each packed set as it goes onto the loading cart.</CardBody>
      ) : (
        <ul className="divide-y divide-line" data-testid="load-items">
          {load.items.map((i) => (
            <li key={i.cycleId} className="flex flex-wrap items-center justify-between gap-3 px-5 py-3">
              <div>
                <p className="text-lg font-semibold text-ink">
                  {i.serial} <span className="font-normal text-ink-soft">· {i.setTypeName}</span>
                </p>
                <p className="text-sm text-muted">
                  {i.organisationName} · {i.sizeStu} StU · {i.placement}
                </p>
              </div>
              <div className="flex items-center gap-3">
                {i.shelf === "lower" && <Badge tone="warn">Lower shelf</Badge>}
                <Badge tone={i.state === "sterilised" || i.state === "released" ? "ok" : "neutral"}>{i.stateLabel}</Badge>
                {load.status === "loading" && (
                  <Button variant="secondary" size="lg" disabled={busy} onClick={() => onRemove(i.cycleId, i.serial)} aria-label={`Take ${i.serial} out of the load`}>
                    Take out
                  </Button>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
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

function AbortForm({ busy, onAbort }: { busy: boolean; onAbort: (reason: string) => void }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  if (!open) {
    return (
      <Button variant="secondary" size="lg" onClick={() => setOpen(true)}>
        <Square className="h-5 w-5" aria-hidden="true" /> The steriliser stopped with a fault…
      </Button>
    );
  }
  return (
    <Card>
      <CardHeader title="Abort the load" description="Every set in it goes back to washing. Say what happened, e.g. the fault the steriliser showed." />
      <CardBody className="space-y-4">
        <Field id="abort-reason" label="What went wrong">
          <Textarea id="abort-reason" value={reason} onChange={(e) => setReason(e.target.value)} className="text-base" />
        </Field>
        <div className="flex flex-wrap gap-3">
          <Button variant="danger" size="lg" disabled={busy} onClick={() => onAbort(reason)}>
            Abort the load
          </Button>
          <Button variant="secondary" size="lg" onClick={() => setOpen(false)}>
            Cancel
          </Button>
        </div>
      </CardBody>
    </Card>
  );
}
