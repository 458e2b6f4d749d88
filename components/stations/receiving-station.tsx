"use client";

import { ArrowRight, CircleAlert, ClipboardCheck, Hand, Layers, PackageCheck, Waves, Wrench } from "lucide-react";
import { useCallback, useState } from "react";
import { toast } from "sonner";
import { ProcessingNotes } from "@/components/stations/processing-notes";
import { ReceivingOrderPanel } from "@/components/stations/receiving-order-panel";
import { ScanField } from "@/components/stations/scan-field";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { cn } from "@/lib/cn";
import type { ErrorBody } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import type {
  FinishReceivingResult,
  HeavySoilResult,
  ReceivingAnswer,
  ReceivingDestination,
  ReceivingOrder,
} from "@/lib/stations/receiving-shared";

// The receiving station: scan a set, see at once what it is, which order it came with and where
// it goes next; mark heavy soil; finish the order when its box is empty.

type Posted<T> = { ok: true; data: T } | { ok: false; status: number; message: string };

/** A v4 UUID for the scan, also where crypto.randomUUID is missing (a station on plain http). */
function newEventId(): string {
  if (typeof crypto.randomUUID === "function") return crypto.randomUUID();
  const b = crypto.getRandomValues(new Uint8Array(16));
  b[6] = (b[6]! & 0x0f) | 0x40;
  b[8] = (b[8]! & 0x3f) | 0x80;
  const h = [...b].map((x) => x.toString(16).padStart(2, "0")).join("");
  return `${h.slice(0, 8)}-${h.slice(8, 12)}-${h.slice(12, 16)}-${h.slice(16, 20)}-${h.slice(20)}`;
}

/** POSTs JSON to a station route; a dropped connection is retried with the same body (and so the same scan id). */
async function post<T>(url: string, body: unknown): Promise<Posted<T>> {
  for (let attempt = 1; ; attempt++) {
    try {
      const res = await fetch(url, { method: "POST", headers: { "content-type": "application/json", accept: "application/json" }, body: JSON.stringify(body) });
      const json = (await res.json().catch(() => null)) as (T & Partial<ErrorBody>) | null;
      if (res.ok && json) return { ok: true, data: json };
      return { ok: false, status: res.status, message: json?.error?.message ?? `The server answered ${res.status}. Scan again.` };
    } catch {
      if (attempt >= 3) return { ok: false, status: 0, message: "The station cannot reach the server. Check the network, then scan again." };
      await new Promise((r) => setTimeout(r, 400 * attempt));
    }
  }
}

const focusScan = () => document.getElementById("station-scan")?.focus();

const DESTINATION_ICON: Record<ReceivingDestination, typeof Hand> = {
  manual_washing: Hand,
  ultrasonic: Waves,
  dismantle: Wrench,
  washer: Layers,
};

interface LogEntry {
  id: number;
  at: string;
  code: string;
  text: string;
  tone: "ok" | "warn" | "danger";
}

export function ReceivingStation({ timeZone, initialOrder }: { timeZone: string; initialOrder: ReceivingOrder | null }) {
  const [answer, setAnswer] = useState<ReceivingAnswer | null>(null);
  const [order, setOrder] = useState<ReceivingOrder | null>(initialOrder);
  const [refusal, setRefusal] = useState<string | null>(null);
  const [finished, setFinished] = useState<FinishReceivingResult | null>(null);
  const [busy, setBusy] = useState(false);
  const [log, setLog] = useState<LogEntry[]>([]);
  const fmt = useCallback((iso: string | null) => formatDateTime(iso, timeZone), [timeZone]);

  const remember = (entry: Omit<LogEntry, "id" | "at">) =>
    setLog((l) => [{ ...entry, id: Date.now() + Math.random(), at: new Date().toISOString() }, ...l].slice(0, 8));

  const followOrder = (next: ReceivingOrder | null) => {
    setOrder(next);
    const url = new URL(window.location.href);
    if (next) url.searchParams.set("order", String(next.id));
    else url.searchParams.delete("order");
    window.history.replaceState(null, "", url);
  };

  const onScan = async (code: string) => {
    setBusy(true);
    setRefusal(null);
    setFinished(null);
    const res = await post<ReceivingAnswer>("/api/stations/receiving/scan", { code, clientEventId: newEventId(), orderId: order?.id ?? null });
    setBusy(false);
    if (!res.ok) {
      setAnswer(null);
      setRefusal(res.message);
      remember({ code, text: res.message, tone: "danger" });
      return;
    }
    setAnswer(res.data);
    if (res.data.order) followOrder(res.data.order);
    remember({
      code: res.data.set.serial,
      text: `${res.data.headline} → ${res.data.route.label}`,
      tone: res.data.outcome === "unexpected" ? "warn" : "ok",
    });
  };

  const toggleHeavySoil = async () => {
    if (!answer) return;
    const wanted = !answer.cycle.heavySoil;
    setBusy(true);
    const res = await post<HeavySoilResult>("/api/stations/receiving/heavy-soil", { cycleId: answer.cycle.id, heavySoil: wanted });
    setBusy(false);
    if (!res.ok) {
      setRefusal(res.message);
    } else {
      setAnswer({ ...answer, cycle: { ...answer.cycle, heavySoil: res.data.heavySoil } });
      toast.success(res.data.heavySoil ? `${answer.set.serial}: heavy soil marked` : `${answer.set.serial}: heavy soil cleared`);
    }
    focusScan();
  };

  const finish = async () => {
    if (!order) return;
    setBusy(true);
    const res = await post<FinishReceivingResult>("/api/stations/receiving/finish", { orderId: order.id });
    setBusy(false);
    if (!res.ok) {
      setRefusal(res.message);
    } else {
      setFinished(res.data);
      setAnswer(null);
      followOrder(null);
      toast.success(res.data.message);
    }
    setTimeout(focusScan, 50);
  };

  return (
    <div className="space-y-6">
      <ScanField onScan={onScan} busy={busy} label="Receive" />
      <div className="grid gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          {refusal && (
            <div role="alert" data-testid="station-refusal" className="rounded-card border-2 border-danger-600 bg-danger-50 p-6 text-danger-700">
              <p className="flex items-center gap-3 text-2xl font-semibold">
                <CircleAlert className="h-8 w-8 shrink-0" aria-hidden="true" />
                <span>✕ Not received</span>
              </p>
              <p className="mt-3 text-xl leading-snug">{refusal}</p>
            </div>
          )}
          {finished && (
            <div role="status" data-testid="receiving-finished" className="rounded-card border-2 border-ok-600/40 bg-ok-50 p-6 text-ok-700">
              <p className="flex items-center gap-3 text-2xl font-semibold">
                <ClipboardCheck className="h-8 w-8 shrink-0" aria-hidden="true" />
                <span>✓ Receiving finished</span>
              </p>
              <p className="mt-3 text-lg">{finished.message}</p>
            </div>
          )}
          {answer ? (
            <AnswerPanel answer={answer} fmt={fmt} busy={busy} onToggleHeavySoil={toggleHeavySoil} />
          ) : (
            !refusal &&
            !finished && (
              <Card>
                <CardBody className="py-10 text-center text-lg text-muted">
                  <PackageCheck className="mx-auto mb-3 h-10 w-10 text-lagoon-600" aria-hidden="true" />
                  Scan the first set of the box. The station shows its order and where it goes next.
                </CardBody>
              </Card>
            )
          )}
        </div>
        <div className="space-y-6">
          {order && <ReceivingOrderPanel order={order} fmt={fmt} busy={busy} onFinish={finish} highlightCycleId={answer?.cycle.id ?? null} />}
          <RecentScans log={log} timeZone={timeZone} />
        </div>
      </div>
      <p className="text-xs text-muted">
        The next step shown follows the set type&apos;s processing notes in the catalogue. It is advisory: the manufacturer&apos;s instructions for use, the
        unit&apos;s validated procedures and its qualified staff decide how each set is processed.
      </p>
    </div>
  );
}

function AnswerPanel({
  answer,
  fmt,
  busy,
  onToggleHeavySoil,
}: {
  answer: ReceivingAnswer;
  fmt: (iso: string | null) => string;
  busy: boolean;
  onToggleHeavySoil: () => void;
}) {
  const unexpected = answer.outcome === "unexpected";
  const Icon = DESTINATION_ICON[answer.route.destination];
  return (
    <section aria-labelledby="received-heading" data-testid="receiving-answer" className="overflow-hidden rounded-card border border-line bg-surface shadow-card">
      <div className={cn("flex flex-wrap items-center justify-between gap-3 px-6 py-4", unexpected ? "bg-warn-50 text-warn-700" : "bg-ok-50 text-ok-700")}>
        <h2 id="received-heading" className="text-2xl font-semibold" data-testid="receiving-outcome">
          <span aria-hidden="true">{unexpected ? "! " : "✓ "}</span>
          {answer.headline}
        </h2>
        {answer.duplicate && <span className="text-sm font-medium">Already recorded a moment ago — nothing was recorded twice.</span>}
      </div>
      <div className="space-y-5 px-6 py-5">
        {unexpected && (
          <p className="rounded-lg border border-warn-600/30 bg-warn-50 px-4 py-3 text-base text-warn-700" data-testid="receiving-unexpected">
            This set was not booked on any pickup. A cycle was opened at standard turnaround and the clinic has been told.
          </p>
        )}
        <div>
          <p className="text-4xl font-semibold tracking-tight tabular-nums text-ink" data-testid="receiving-serial">
            {answer.set.serial}
          </p>
          <p className="mt-1 text-xl text-ink-soft">{answer.set.typeName}</p>
          <p className="mt-1 text-base text-muted">
            {answer.set.customerName} · {answer.set.homeSiteName} · {answer.set.instruments} instruments
          </p>
          <div className="mt-2 flex flex-wrap gap-2">
            {answer.cycle.serviceLevel === "express" && <Badge tone="warn">Express</Badge>}
            {answer.cycle.loaner && <Badge tone="warn">Loaner set</Badge>}
            <Badge tone="info">{answer.cycle.stateLabel}</Badge>
          </div>
        </div>

        <div className="rounded-card border-2 border-lagoon-600 bg-lagoon-50 px-5 py-4" data-testid="receiving-route">
          <p className="text-sm font-medium uppercase tracking-wide text-lagoon-800">Next</p>
          <p className="mt-1 flex items-center gap-3 text-3xl font-semibold text-lagoon-900">
            <Icon className="h-9 w-9 shrink-0" aria-hidden="true" />
            <ArrowRight className="h-7 w-7 shrink-0" aria-hidden="true" />
            {answer.route.label}
          </p>
          {answer.route.steps.length > 1 && (
            <ol className="mt-3 list-decimal space-y-1 pl-6 text-base text-lagoon-900">
              {answer.route.steps.map((s) => (
                <li key={s}>{s}</li>
              ))}
            </ol>
          )}
        </div>

        {answer.warnings.length > 0 && (
          <ul className="space-y-2" aria-label="Warnings">
            {answer.warnings.map((w) => (
              <li key={w} className="flex gap-2 rounded-lg bg-warn-50 px-4 py-3 text-base text-warn-700">
                <span aria-hidden="true">!</span>
                {w}
              </li>
            ))}
          </ul>
        )}

        <dl className="grid gap-4 text-base sm:grid-cols-2">
          <div>
            <dt className="text-sm text-muted">Received</dt>
            <dd className="font-medium tabular-nums">
              {fmt(answer.cycle.receivedAt)}
              {answer.cycle.receivedBy ? ` by ${answer.cycle.receivedBy}` : ""}
            </dd>
          </div>
          <div>
            <dt className="text-sm text-muted">Promised back by</dt>
            <dd className="font-medium tabular-nums">
              {fmt(answer.cycle.promisedAt)} <span className="text-muted">({answer.cycle.serviceLevel === "express" ? "express" : "standard"})</span>
            </dd>
          </div>
        </dl>

        <div className="flex flex-wrap items-center gap-3 border-t border-line pt-4">
          <Button
            size="lg"
            variant={answer.cycle.heavySoil ? "accent" : "secondary"}
            aria-pressed={answer.cycle.heavySoil}
            onClick={onToggleHeavySoil}
            disabled={busy || answer.cycle.state !== "received"}
            data-testid="heavy-soil-toggle"
          >
            <span aria-hidden="true">{answer.cycle.heavySoil ? "☑" : "☐"}</span>
            Heavy soil or no pre-clean
          </Button>
          <span className="text-sm text-muted">{answer.cycle.heavySoil ? "Marked: the heavy-soil surcharge applies to this set." : "Tap if the set came heavily soiled or not pre-cleaned."}</span>
        </div>
        <ProcessingNotes typeName={answer.set.typeName} flags={answer.processing.flags} notes={answer.processing.notes} ifuFileId={answer.processing.ifuFileId} />
      </div>
    </section>
  );
}

const LOG_TONE = { ok: "text-ok-700", warn: "text-warn-700", danger: "text-danger-700" } as const;
const LOG_MARK = { ok: "✓", warn: "!", danger: "✕" } as const;

function RecentScans({ log, timeZone }: { log: LogEntry[]; timeZone: string }) {
  if (log.length === 0) return null;
  return (
    <Card>
      <CardHeader title="This session's scans" description="Newest first, on this screen only." />
      <CardBody className="p-0">
        <ul className="divide-y divide-line" data-testid="receiving-log">
          {log.map((e) => (
            <li key={e.id} className="flex gap-3 px-5 py-2.5 text-sm">
              <span className="tabular-nums text-muted">{formatDateTime(e.at, timeZone).split(", ").pop()}</span>
              <span className={cn("font-medium", LOG_TONE[e.tone])}>
                <span aria-hidden="true">{LOG_MARK[e.tone]} </span>
                {e.code}
              </span>
              <span className="min-w-0 flex-1 truncate text-ink-soft" title={e.text}>
                {e.text}
              </span>
            </li>
          ))}
        </ul>
      </CardBody>
    </Card>
  );
}
