"use client";

import { CheckCircle2, CircleAlert, Clock, MapPin, PackageCheck, PackageOpen, Phone, ScanLine, TriangleAlert } from "lucide-react";
import Link from "next/link";
import { useCallback, useMemo, useRef, useState } from "react";
import { newClientEventId } from "@/components/stations/post";
import { ScanField } from "@/components/stations/scan-field";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Dialog, DialogClose, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { Field } from "@/components/ui/field";
import { cn } from "@/lib/cn";
import { formatDateTime } from "@/lib/format";
import {
  codeMatchesSet,
  NOT_SERVED_REASONS,
  type NotServedReason,
  type RunSheet,
  type RunSheetSet,
  type RunSheetStop,
} from "@/lib/runs/shared";
import type { Settled } from "./outbox";
import { SignaturePad, type SignaturePadHandle } from "./signature-pad";
import { useOutbox } from "./use-outbox";
import { WaitingToSend } from "./waiting-to-send";

// One stop on the driver's phone: what to hand over and what to collect, a scan field for a
// Bluetooth or keyboard-wedge scanner and a tap on each set as the other way to confirm it, the
// receiver's name and signature, or why the stop could not be served. Everything the driver does
// goes through the phone's outbox, so a weak connection loses nothing and repeats nothing.

interface Notice {
  tone: "ok" | "danger" | "info";
  text: string;
}

const NOTICE_TONE = {
  ok: "border-ok-600/40 bg-ok-50 text-ok-700",
  danger: "border-danger-600 bg-danger-50 text-danger-700",
  info: "border-lagoon-200 bg-lagoon-50 text-lagoon-900",
} as const;

export function StopScreen({ runId, initialStop, stopCount, timeZone }: { runId: number; initialStop: RunSheetStop; stopCount: number; timeZone: string }) {
  const [stop, setStop] = useState(initialStop);
  const [notice, setNotice] = useState<Notice | null>(null);
  const group = `stop:${stop.id}`;
  const base = `/api/runs/${runId}/stops/${stop.id}`;

  const refresh = useCallback(async () => {
    try {
      const res = await fetch(`/api/runs/${runId}`, { headers: { accept: "application/json" } });
      if (!res.ok) return;
      const sheet = (await res.json()) as RunSheet;
      const next = sheet.stops.find((s) => s.id === initialStop.id);
      if (next) setStop(next);
    } catch {
      // Offline: the screen keeps what it shows; the outbox says what is waiting.
    }
  }, [runId, initialStop.id]);

  const onSettled = useCallback(
    (s: Settled) => {
      if (s.item.group !== group) return;
      if (s.result.kind === "refused") {
        // A refused scan's reason already names the set; a refused sign-off needs saying which.
        const scanRefused = s.item.url.endsWith("/scans");
        setNotice({ tone: "danger", text: scanRefused ? s.result.message : `${s.item.label}: ${s.result.message}` });
      } else {
        const data = s.result.data as { message?: string } | null;
        setNotice({ tone: "ok", text: data?.message ?? `${s.item.label}: sent.` });
      }
      void refresh();
    },
    [group, refresh],
  );
  const outbox = useOutbox(onSettled);
  const waiting = outbox.items.filter((i) => i.group === group);
  const completing = waiting.find((i) => i.url.endsWith("/complete"));
  const everySet = useMemo(() => [...stop.deliver, ...stop.collect], [stop]);

  /** The sets a waiting scan names (by the tapped cycle, or by a scanned code that matches). */
  const waitingFor = useCallback(
    (set: RunSheetSet) =>
      waiting.some((i) => i.body.cycleId === set.cycleId || (typeof i.body.code === "string" && codeMatchesSet(i.body.code, set))),
    [waiting],
  );

  const queueScan = (body: { code?: string; cycleId?: number }, label: string) => {
    const id = newClientEventId();
    outbox.enqueue({ id, url: `${base}/scans`, body, label, group });
    if (!navigator.onLine) setNotice({ tone: "info", text: `${label}: no connection, kept on the phone and sent when it is back.` });
  };

  const onScan = (code: string) => {
    const known = everySet.find((s) => codeMatchesSet(code, s));
    if (known && (known.scanned || waitingFor(known))) {
      setNotice({ tone: "info", text: `${known.serial} is already scanned.` });
      return;
    }
    if (known?.blocked) {
      setNotice({ tone: "danger", text: `${known.serial}: ${known.blocked}` });
      return;
    }
    setNotice(null);
    queueScan({ code }, `Scan ${known?.serial ?? code}`);
  };

  const onTap = (set: RunSheetSet) => {
    setNotice(null);
    queueScan({ cycleId: set.cycleId }, `${set.serial} ${set.role === "collect" ? "collected" : "handed over"}`);
  };

  const scannedCount = everySet.filter((s) => s.scanned || waitingFor(s)).length;
  const open = stop.status === "planned" && !completing;

  return (
    <div className="space-y-4 pb-10">
      <Link href="/driver" className="text-sm font-medium text-lagoon-700 underline">
        ← Run sheet
      </Link>
      <header className="space-y-1">
        <p className="text-sm font-medium text-muted">
          Stop {stop.position} of {stopCount} · {kindText(stop.kind)}
        </p>
        <h1 className="text-2xl font-semibold leading-tight text-ink" data-testid="stop-site">
          {stop.siteName}
        </h1>
        <p className="text-sm text-ink-soft">{stop.organisationName}</p>
        <p className="flex items-start gap-2 text-base text-ink">
          <MapPin className="mt-0.5 h-5 w-5 shrink-0 text-lagoon-700" aria-hidden="true" />
          {stop.address}
        </p>
        <p className="flex items-center gap-2 text-base text-ink">
          <Clock className="h-5 w-5 shrink-0 text-lagoon-700" aria-hidden="true" />
          <span>
            Window {stop.window}
            {stop.plannedTime && <span className="text-muted"> · planned {stop.plannedTime}</span>}
          </span>
        </p>
        {stop.contactPhone && (
          <a href={`tel:${stop.contactPhone.replace(/\s+/g, "")}`} className="flex items-center gap-2 text-base font-medium text-lagoon-700 underline">
            <Phone className="h-5 w-5 shrink-0" aria-hidden="true" />
            {stop.contactName ? `${stop.contactName}, ` : ""}
            {stop.contactPhone}
          </a>
        )}
        {stop.deliveryNotes && <p className="rounded-lg bg-paper px-3 py-2 text-sm text-ink-soft">{stop.deliveryNotes}</p>}
      </header>

      <WaitingToSend items={waiting} onSend={outbox.flush} />
      {notice && (
        <p role={notice.tone === "danger" ? "alert" : "status"} data-testid="stop-notice" className={cn("rounded-card border-2 px-4 py-3 text-base", NOTICE_TONE[notice.tone])}>
          {notice.text}
        </p>
      )}

      {stop.status !== "planned" && <ClosedStop stop={stop} timeZone={timeZone} />}
      {completing && stop.status === "planned" && (
        <p role="status" className="rounded-card border-2 border-lagoon-200 bg-lagoon-50 px-4 py-3 text-base text-lagoon-900">
          {completing.body.outcome === "served" ? "Signed off on the phone" : "Recorded as not served on the phone"}: it is sent as soon as the connection allows.
        </p>
      )}

      {open && <ScanField onScan={onScan} label="Scan" placeholder="Scan a set's label" />}

      <SetList title="Hand over" icon="deliver" sets={stop.deliver} waitingFor={waitingFor} open={open} onTap={onTap} />
      <SetList title="Collect" icon="collect" sets={stop.collect} waitingFor={waitingFor} open={open} onTap={onTap} />

      {open && (
        <SignOff
          scannedCount={scannedCount}
          unscanned={stop.deliver.filter((s) => !s.done && !s.blocked && !s.scanned && !waitingFor(s)).length}
          onSignOff={(receiverName, signature) => {
            setNotice(null);
            outbox.enqueue({
              id: newClientEventId(),
              url: `${base}/complete`,
              body: { outcome: "served", receiverName, signature },
              label: `Sign-off of stop ${stop.position} by ${receiverName}`,
              group,
            });
          }}
        />
      )}
      {open && (
        <NotServed
          onRecord={(reason, note) => {
            setNotice(null);
            outbox.enqueue({
              id: newClientEventId(),
              url: `${base}/complete`,
              body: { outcome: "not_served", reason, ...(note ? { note } : {}) },
              label: `Stop ${stop.position} not served (${NOT_SERVED_REASONS[reason].toLowerCase()})`,
              group,
            });
          }}
        />
      )}
      <p className="text-xs text-muted">
        Before handing a set over, check its pack is intact and dry and its indicator has changed. This screen is advisory: the unit&apos;s validated procedures,
        its qualified staff and local regulations decide what may be handed over, and a doubtful pack goes back to the unit.
      </p>
    </div>
  );
}

function kindText(kind: RunSheetStop["kind"]): string {
  return kind === "both" ? "hand over and collect" : kind === "delivery" ? "hand over" : "collect";
}

function ClosedStop({ stop, timeZone }: { stop: RunSheetStop; timeZone: string }) {
  if (stop.status === "served") {
    return (
      <div role="status" data-testid="stop-closed" className="rounded-card border-2 border-ok-600/40 bg-ok-50 px-4 py-3 text-ok-700">
        <p className="flex items-center gap-2 text-lg font-semibold">
          <CheckCircle2 className="h-6 w-6" aria-hidden="true" /> Signed off
        </p>
        <p className="mt-1 text-base">
          By {stop.signedByName} at {formatDateTime(stop.servedAt, timeZone).split(", ").pop()}.
        </p>
        {stop.signatureFileId && (
          // Served by our own files route, so next/image has nothing to add.
          // eslint-disable-next-line @next/next/no-img-element
          <img src={`/api/files/${stop.signatureFileId}`} alt={`Signature of ${stop.signedByName}`} className="mt-2 h-20 rounded border border-line bg-white" />
        )}
        <Link href="/driver" className="mt-3 inline-block text-base font-medium underline">
          Back to the run sheet for the next stop
        </Link>
      </div>
    );
  }
  return (
    <div role="status" data-testid="stop-closed" className="rounded-card border-2 border-warn-600/40 bg-warn-50 px-4 py-3 text-warn-700">
      <p className="flex items-center gap-2 text-lg font-semibold">
        <TriangleAlert className="h-6 w-6" aria-hidden="true" /> Not served
      </p>
      <p className="mt-1 text-base">{stop.notServedReason}. Its sets stay as they were; the dispatcher plans it again.</p>
    </div>
  );
}

function SetList({
  title,
  icon,
  sets,
  waitingFor,
  open,
  onTap,
}: {
  title: string;
  icon: "deliver" | "collect";
  sets: RunSheetSet[];
  waitingFor: (s: RunSheetSet) => boolean;
  open: boolean;
  onTap: (s: RunSheetSet) => void;
}) {
  if (sets.length === 0) return null;
  const Icon = icon === "deliver" ? PackageCheck : PackageOpen;
  const confirmed = sets.filter((s) => s.done || s.scanned || waitingFor(s)).length;
  return (
    <Card>
      <CardHeader title={`${title} (${confirmed} of ${sets.length})`} description={icon === "deliver" ? "Sterile sets to hand over here." : "Used sets to take back to the unit."} />
      <CardBody className="p-0">
        <ul className="divide-y divide-line" aria-label={title}>
          {sets.map((s) => {
            const pending = waitingFor(s);
            const tappable = open && !s.done && !s.scanned && !pending && !s.blocked;
            const status = s.done ? (s.role === "collect" ? "Collected" : "Delivered") : s.scanned ? "Scanned" : pending ? "Waiting to send" : null;
            return (
              <li key={`${s.role}-${s.cycleId}`} data-testid="stop-set" data-serial={s.serial} data-status={status ?? (s.blocked ? "blocked" : "to_scan")}>
                <button
                  type="button"
                  disabled={!tappable}
                  onClick={() => onTap(s)}
                  className={cn(
                    "flex min-h-16 w-full items-center gap-3 px-4 py-3 text-left",
                    tappable ? "hover:bg-lagoon-50 active:bg-lagoon-100" : "cursor-default",
                  )}
                  aria-label={tappable ? `Confirm ${s.serial}, ${s.typeName}` : undefined}
                >
                  <Icon className={cn("h-7 w-7 shrink-0", status ? "text-ok-600" : s.blocked ? "text-warn-600" : "text-lagoon-700")} aria-hidden="true" />
                  <span className="min-w-0 flex-1">
                    <span className="block text-base font-semibold tabular-nums text-ink">{s.serial}</span>
                    <span className="block text-sm text-ink-soft">{s.typeName}</span>
                    {s.blocked && !s.done && <span className="mt-1 block text-sm text-warn-700">{s.blocked}</span>}
                  </span>
                  {status ? (
                    <Badge tone={pending ? "warn" : "ok"}>{status}</Badge>
                  ) : tappable ? (
                    <span className="flex items-center gap-1 rounded-lg border border-line-strong px-3 py-2 text-sm font-medium text-ink">
                      <ScanLine className="h-4 w-4" aria-hidden="true" /> Tap to confirm
                    </span>
                  ) : null}
                </button>
              </li>
            );
          })}
        </ul>
      </CardBody>
    </Card>
  );
}

function SignOff({ scannedCount, unscanned, onSignOff }: { scannedCount: number; unscanned: number; onSignOff: (name: string, png: string) => void }) {
  const pad = useRef<SignaturePadHandle>(null);
  const [name, setName] = useState("");
  const [signed, setSigned] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const submit = () => {
    const png = pad.current?.toPng();
    if (scannedCount === 0) return setError("Scan or tap the sets handed over first.");
    if (name.trim().length < 2) return setError("Type the receiver's name.");
    if (!png) return setError("Ask the receiver to sign in the box.");
    setError(null);
    onSignOff(name.trim(), png);
  };
  return (
    <Card>
      <CardHeader title="Receiver signs" description={`${scannedCount} set${scannedCount === 1 ? "" : "s"} scanned at this stop.`} />
      <CardBody className="space-y-4">
        {unscanned > 0 && (
          <p className="flex gap-2 rounded-lg bg-warn-50 px-3 py-2 text-sm text-warn-700">
            <CircleAlert className="h-4 w-4 shrink-0" aria-hidden="true" />
            {unscanned} set{unscanned === 1 ? "" : "s"} to hand over {unscanned === 1 ? "is" : "are"} not scanned: {unscanned === 1 ? "it stays" : "they stay"} on the van.
          </p>
        )}
        <Field id="receiver-name" label="Receiver's name">
          <input
            id="receiver-name"
            value={name}
            onChange={(e) => setName(e.target.value)}
            autoComplete="off"
            className="h-12 w-full rounded-lg border border-line-strong bg-surface px-3 text-base text-ink focus:outline-none focus:ring-4 focus:ring-lagoon-200"
          />
        </Field>
        <SignaturePad ref={pad} onChange={setSigned} />
        {error && (
          <p role="alert" className="text-sm font-medium text-danger-700">
            {error}
          </p>
        )}
        <Button size="lg" className="w-full" onClick={submit} disabled={!signed || scannedCount === 0} data-testid="sign-off">
          <CheckCircle2 className="h-5 w-5" aria-hidden="true" /> Sign off this stop
        </Button>
      </CardBody>
    </Card>
  );
}

function NotServed({ onRecord }: { onRecord: (reason: NotServedReason, note: string | null) => void }) {
  const [reason, setReason] = useState<NotServedReason | null>(null);
  const [note, setNote] = useState("");
  const [error, setError] = useState<string | null>(null);
  const record = () => {
    if (!reason) return setError("Choose why the stop could not be served.");
    if (reason === "other" && note.trim().length < 3) return setError("Say in a few words why.");
    onRecord(reason, note.trim() || null);
  };
  return (
    <Dialog>
      <DialogTrigger asChild>
        <Button variant="secondary" size="lg" className="w-full">
          <TriangleAlert className="h-5 w-5" aria-hidden="true" /> Could not serve this stop
        </Button>
      </DialogTrigger>
      <DialogContent title="Why could the stop not be served?" description="Its sets stay as they were, and the dispatcher plans it again.">
        <fieldset className="space-y-2">
          <legend className="sr-only">Reason</legend>
          {(Object.keys(NOT_SERVED_REASONS) as NotServedReason[]).map((r) => (
            <label key={r} className={cn("flex min-h-12 items-center gap-3 rounded-lg border px-3", reason === r ? "border-lagoon-600 bg-lagoon-50" : "border-line")}>
              <input type="radio" name="not-served-reason" value={r} checked={reason === r} onChange={() => setReason(r)} className="h-5 w-5" />
              <span className="text-base">{NOT_SERVED_REASONS[r]}</span>
            </label>
          ))}
        </fieldset>
        <Field id="not-served-note" label={reason === "other" ? "What happened" : "Note (optional)"} className="mt-4">
          <textarea
            id="not-served-note"
            value={note}
            onChange={(e) => setNote(e.target.value)}
            rows={3}
            maxLength={500}
            className="w-full rounded-lg border border-line-strong bg-surface px-3 py-2 text-base focus:outline-none focus:ring-4 focus:ring-lagoon-200"
          />
        </Field>
        {error && (
          <p role="alert" className="mt-2 text-sm font-medium text-danger-700">
            {error}
          </p>
        )}
        <div className="mt-4 flex gap-3">
          <DialogClose asChild>
            <Button variant="secondary" size="lg" className="flex-1">
              Back
            </Button>
          </DialogClose>
          {reason && (reason !== "other" || note.trim().length >= 3) ? (
            <DialogClose asChild>
              <Button variant="danger" size="lg" className="flex-1" onClick={record}>
                Record
              </Button>
            </DialogClose>
          ) : (
            <Button variant="danger" size="lg" className="flex-1" onClick={record}>
              Record
            </Button>
          )}
        </div>
      </DialogContent>
    </Dialog>
  );
}

