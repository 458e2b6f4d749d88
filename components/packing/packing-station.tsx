"use client";

import { CircleAlert, CircleCheck, Download, Package, PauseCircle, Printer } from "lucide-react";
import { type ReactNode, useState } from "react";
import { toast } from "sonner";
import { ProcessingNotes } from "@/components/stations/processing-notes";
import { ScanField } from "@/components/stations/scan-field";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Select, Textarea } from "@/components/ui/input";
import { type Packaging, PACKAGING_LABELS, PACKAGINGS } from "@/lib/catalogue/vocabulary";
import type { FieldErrors } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { checkCounts, irregularityText } from "@/lib/packing/checklist";
import type { PackDecision, PackRequest } from "@/lib/packing/schemas";
import type { PackingSetView, PackResult } from "@/lib/packing/service";
import { ContentsChecklist, type LineEntry } from "./contents-checklist";
import { newClientEventId, postJson } from "@/components/stations/post";
import { type PouchChoice, PouchHelper } from "./pouch-helper";

// The packing station: scan a washed set, count its contents against the list, choose the
// packaging (and the pouch), then pack it, pack it with an irregularity, or hold it; print its label.

const focusScan = () => setTimeout(() => document.getElementById("station-scan")?.focus(), 30);

function withoutKey(fields: FieldErrors, key: string): FieldErrors {
  const rest = { ...fields };
  delete rest[key];
  return rest;
}

/** Field errors of the pack route keyed "line.<position>", by position. */
function lineErrors(fields: FieldErrors): Record<number, string[]> {
  const byLine: Record<number, string[]> = {};
  for (const [key, messages] of Object.entries(fields)) {
    const match = /^line\.(\d+)$/.exec(key);
    if (match) byLine[Number(match[1])] = messages;
  }
  return byLine;
}

export function PackingStation({ timeZone }: { timeZone: string }) {
  const [view, setView] = useState<PackingSetView | null>(null);
  const [scanError, setScanError] = useState<string | null>(null);
  const [result, setResult] = useState<PackResult | null>(null);
  const [busy, setBusy] = useState(false);

  const onScan = async (code: string) => {
    setBusy(true);
    setScanError(null);
    setResult(null);
    const res = await postJson<PackingSetView>("/api/stations/packing/scan", { code });
    setBusy(false);
    if (!res.ok) {
      setView(null);
      setScanError(res.message);
      return;
    }
    setView(res.data);
  };

  const onDone = (done: PackResult) => {
    setResult(done);
    setView(null);
    toast.success(done.outcome === "packed" ? `${done.serial} packed` : `${done.serial} held`);
    focusScan();
  };

  return (
    <div className="space-y-6">
      <ScanField onScan={onScan} busy={busy} label="Scan set" />
      {scanError && <Refusal title="Not found" message={scanError} />}
      {result && <ResultPanel result={result} timeZone={timeZone} />}
      {view ? (
        <SetPanel key={`${view.set.id}-${view.cycle?.id ?? 0}`} view={view} timeZone={timeZone} onDone={onDone} />
      ) : (
        !scanError &&
        !result && (
          <Card>
            <CardBody className="py-10 text-center text-lg text-muted">
              <Package className="mx-auto mb-3 h-10 w-10 text-lagoon-600" aria-hidden="true" />
              Scan a washed set. The station shows its contents list to count before it is packed.
            </CardBody>
          </Card>
        )
      )}
      <p className="text-xs text-muted">
        The contents check and the pouch advice support the packer; they are advisory. The instrument manufacturer&apos;s instructions for use, the
        unit&apos;s validated packing procedures and its qualified staff decide whether a set is fit to pack.
      </p>
    </div>
  );
}

function Refusal({ title, message, children }: { title: string; message: string; children?: ReactNode }) {
  return (
    <div role="alert" data-testid="station-refusal" className="rounded-card border-2 border-danger-600 bg-danger-50 p-6 text-danger-700">
      <p className="flex items-center gap-3 text-2xl font-semibold">
        <CircleAlert className="h-8 w-8 shrink-0" aria-hidden="true" />
        <span>✕ {title}</span>
      </p>
      <p className="mt-3 text-xl leading-snug">{message}</p>
      {children}
    </div>
  );
}

function LabelButtons({ labelUrl, pdfUrl }: { labelUrl: string; pdfUrl: string }) {
  return (
    <div className="mt-4 flex flex-wrap gap-3">
      <Button size="lg" asChild>
        <a href={labelUrl} target="_blank" rel="noreferrer">
          <Printer className="h-5 w-5" aria-hidden="true" />
          Print label
        </a>
      </Button>
      <Button size="lg" variant="secondary" asChild>
        <a href={pdfUrl} download>
          <Download className="h-5 w-5" aria-hidden="true" />
          Download PDF
        </a>
      </Button>
    </div>
  );
}

function ResultPanel({ result, timeZone }: { result: PackResult; timeZone: string }) {
  const packed = result.outcome === "packed";
  return (
    <div
      role="status"
      data-testid="packing-result"
      className={packed ? "rounded-card border-2 border-ok-600/40 bg-ok-50 p-6 text-ok-700" : "rounded-card border-2 border-warn-600/40 bg-warn-50 p-6 text-warn-700"}
    >
      <p className="flex items-center gap-3 text-2xl font-semibold">
        {packed ? <CircleCheck className="h-8 w-8 shrink-0" aria-hidden="true" /> : <PauseCircle className="h-8 w-8 shrink-0" aria-hidden="true" />}
        <span>
          {result.serial} {packed ? "packed" : "on hold"}
        </span>
      </p>
      <p className="mt-2 text-lg">
        {packed
          ? `${result.record.packagingLabel}, by ${result.record.packedByName ?? "you"} at ${formatDateTime(result.record.at, timeZone)}. Next: a steriliser load.`
          : `${result.holdReason ?? "Held"}. The quality lead decides whether it is cleared or sent back to washing.`}
      </p>
      {result.irregularityTexts.length > 0 && packed && (
        <p className="mt-2 text-lg font-semibold" data-testid="result-irregularity">
          Irregularity on the label: {result.irregularityTexts.join("; ")}
        </p>
      )}
      {result.duplicate && <p className="mt-2 text-sm">This was already recorded; nothing was recorded twice.</p>}
      {packed && result.labelUrl && result.labelPdfUrl && <LabelButtons labelUrl={result.labelUrl} pdfUrl={result.labelPdfUrl} />}
    </div>
  );
}

function SetPanel({ view, timeZone, onDone }: { view: PackingSetView; timeZone: string; onDone: (result: PackResult) => void }) {
  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="space-y-4">
          <div className="flex flex-wrap items-start justify-between gap-4">
            <div>
              <p className="text-3xl font-bold tabular-nums text-ink" data-testid="packing-serial">
                {view.set.serial}
              </p>
              <p className="mt-1 text-xl text-ink">
                {view.type.name} <span className="text-base text-muted">({view.type.code})</span>
              </p>
              <p className="text-base text-muted">
                {view.set.organisationName} · {view.set.homeSiteName}
              </p>
            </div>
            <div className="flex flex-col items-end gap-2">
              {view.cycle && <Badge tone={view.cycle.state === "washed" ? "info" : view.cycle.state === "on_hold" ? "warn" : "neutral"}>{view.cycle.stateLabel}</Badge>}
              {view.cycle?.serviceLevel === "express" && <Badge tone="warn">Express</Badge>}
              {view.cycle?.promisedAt && <p className="text-sm text-muted">Promised back {formatDateTime(view.cycle.promisedAt, timeZone)}</p>}
            </div>
          </div>
          <ProcessingNotes typeName={view.type.name} flags={view.type.flags} notes={view.type.processingNotes} ifuFileId={view.type.ifuFileId} />
        </CardBody>
      </Card>
      {view.refusal ? (
        <Refusal title="Not packed" message={view.refusal}>
          {view.cycle?.holdReason && <p className="mt-2 text-lg">Held: {view.cycle.holdReason}</p>}
          {view.nextStep && <p className="mt-2 text-lg">{view.nextStep}</p>}
          {view.packed?.labelUrl && view.packed.labelPdfUrl && <LabelButtons labelUrl={view.packed.labelUrl} pdfUrl={view.packed.labelPdfUrl} />}
        </Refusal>
      ) : (
        <PackForm view={view} onDone={onDone} />
      )}
    </div>
  );
}

function PackForm({ view, onDone }: { view: PackingSetView; onDone: (result: PackResult) => void }) {
  const items = view.type.items;
  const [entries, setEntries] = useState<Record<number, LineEntry>>({});
  const [packaging, setPackaging] = useState<Packaging>(view.type.packaging);
  const [packagingReason, setPackagingReason] = useState("");
  const [pouch, setPouch] = useState<PouchChoice | null>(null);
  const [note, setNote] = useState("");
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<{ message: string; fields: FieldErrors } | null>(null);
  // One id per packing of this scan: a retried request is recorded once.
  const [clientEventId] = useState(newClientEventId);

  const counts = items.map((item) => ({
    position: item.position,
    counted: entries[item.position]?.counted ?? null,
    damaged: entries[item.position]?.damaged ?? 0,
  }));
  const check = checkCounts(items, counts);
  const counted = counts.filter((c) => c.counted !== null).length;
  const irregularities = check.ok ? check.irregularities : [];
  const changed = packaging !== view.type.packaging;
  const pouched = packaging === "single_pouch" || packaging === "double_pouch";

  const submit = async (decision: PackDecision) => {
    setBusy(true);
    setError(null);
    const body: PackRequest = {
      cycleId: view.cycle!.id,
      clientEventId,
      decision,
      counts,
      packaging,
      packagingReason: changed ? packagingReason : "",
      pouch: pouched && pouch ? { inner: pouch.inner, outer: packaging === "double_pouch" ? pouch.outer : null } : null,
      note,
    };
    const res = await postJson<PackResult>("/api/stations/packing/pack", body);
    setBusy(false);
    if (!res.ok) {
      setError({ message: res.message, fields: res.fields });
      return;
    }
    onDone(res.data);
  };

  const fieldError = (key: string) => error?.fields[key]?.[0];

  if (items.length === 0) {
    return <Refusal title="No contents list" message="This set type has no contents list to count against. Add its contents in the catalogue first." />;
  }

  return (
    <div className="grid gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
      <Card>
        <CardHeader title="Contents" description={`Count every line: ${counted} of ${items.length} counted. A damaged instrument is counted too, and marked damaged.`} />
        <CardBody>
          <ContentsChecklist
            items={items}
            entries={entries}
            errors={error ? lineErrors(error.fields) : {}}
            disabled={busy}
            onChange={(position, entry) => {
              setEntries((all) => ({ ...all, [position]: entry }));
              // A line counted again drops its earlier complaint; once no complaint is left, so does the message.
              setError((e) => {
                if (!e || !e.fields[`line.${position}`]) return e;
                const fields = withoutKey(e.fields, `line.${position}`);
                return Object.keys(fields).length === 0 ? null : { ...e, fields };
              });
            }}
          />
        </CardBody>
      </Card>
      <div className="space-y-6 xl:sticky xl:top-4 xl:max-h-[calc(100vh-2rem)] xl:self-start xl:overflow-y-auto">
        <Card>
          <CardHeader title="Packaging" description={`This set type is packed as: ${view.type.packagingLabel}.`} />
          <CardBody className="space-y-4">
            <Field id="packaging" label="Packaging for this pack">
              <Select id="packaging" className="h-12 text-base" value={packaging} disabled={busy} onChange={(e) => setPackaging(e.target.value as Packaging)}>
                {PACKAGINGS.map((p) => (
                  <option key={p} value={p}>
                    {PACKAGING_LABELS[p]}
                    {p === view.type.packaging ? " (the set type's)" : ""}
                  </option>
                ))}
              </Select>
            </Field>
            {changed && (
              <Field id="packaging-reason" label="Why is it packed differently?" error={fieldError("packagingReason")}>
                <Textarea
                  id="packaging-reason"
                  value={packagingReason}
                  disabled={busy}
                  aria-invalid={!!fieldError("packagingReason") || undefined}
                  onChange={(e) => setPackagingReason(e.target.value)}
                  className="min-h-20 text-base"
                />
              </Field>
            )}
            {pouched && <PouchHelper double={packaging === "double_pouch"} value={pouch} onChange={setPouch} error={fieldError("pouch")} disabled={busy} />}
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Pack" />
          <CardBody className="space-y-4">
            {!check.ok && check.uncounted.length > 0 && (
              <p className="text-base text-muted" data-testid="uncounted">
                {check.uncounted.length} line{check.uncounted.length === 1 ? "" : "s"} not counted yet.
              </p>
            )}
            {irregularities.length > 0 && (
              <div className="rounded-lg border-2 border-warn-600/40 bg-warn-50 p-4 text-warn-700" data-testid="irregularities">
                <p className="text-lg font-semibold">Not as listed:</p>
                <ul className="mt-1 list-disc pl-5 text-base">
                  {irregularities.map((i) => (
                    <li key={`${i.kind}-${i.name}`}>{irregularityText(i)}</li>
                  ))}
                </ul>
                <p className="mt-2 text-sm">
                  Hold the set, or pack it with the irregularity: it is printed on the label, and a missing instrument is investigated (and charged as
                  the contract says).
                </p>
              </div>
            )}
            <Field id="pack-note" label="Note (optional; the reason when holding a complete set)" error={fieldError("note")}>
              <Textarea id="pack-note" value={note} disabled={busy} onChange={(e) => setNote(e.target.value)} className="min-h-16 text-base" />
            </Field>
            {error && (
              <p role="alert" data-testid="form-error" className="rounded-lg border-2 border-danger-600 bg-danger-50 px-4 py-3 text-lg font-medium text-danger-700">
                {error.message}
              </p>
            )}
            <div className="flex flex-wrap gap-3">
              {irregularities.length > 0 ? (
                <>
                  <Button size="lg" variant="accent" disabled={busy} onClick={() => submit("pack_with_irregularity")}>
                    <Package className="h-5 w-5" aria-hidden="true" />
                    Pack with irregularity
                  </Button>
                  <Button size="lg" variant="danger" disabled={busy} onClick={() => submit("hold")}>
                    <PauseCircle className="h-5 w-5" aria-hidden="true" />
                    Hold the set
                  </Button>
                </>
              ) : (
                <>
                  <Button size="lg" disabled={busy} onClick={() => submit("pack")}>
                    <Package className="h-5 w-5" aria-hidden="true" />
                    {busy ? "Packing…" : "Pack"}
                  </Button>
                  <Button size="lg" variant="secondary" disabled={busy} onClick={() => submit("hold")}>
                    <PauseCircle className="h-5 w-5" aria-hidden="true" />
                    Hold the set
                  </Button>
                </>
              )}
            </div>
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
