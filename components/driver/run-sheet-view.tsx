import { ChevronRight, Clock, MapPin, PackageCheck, PackageOpen } from "lucide-react";
import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { cn } from "@/lib/cn";
import type { RunSheet, RunSheetStop } from "@/lib/runs/shared";

// The driver's run sheet: the van, then every stop in order with its address, window, planned
// time and the sets to hand over and collect. Each stop opens its own page.

export function RunSheetView({ sheet }: { sheet: RunSheet }) {
  const served = sheet.stops.filter((s) => s.status !== "planned").length;
  const next = sheet.stops.find((s) => s.status === "planned");
  return (
    <section aria-labelledby={`run-${sheet.runId}`} className="space-y-3">
      <div className="rounded-card border border-line bg-surface px-4 py-3 shadow-card">
        <h2 id={`run-${sheet.runId}`} className="text-lg font-semibold text-ink">
          {sheet.vanName} <span className="font-normal text-muted">· {sheet.vanRegistration}</span>
        </h2>
        <p className="text-sm text-ink-soft">
          {sheet.startTime ? `Leave the unit ${sheet.startTime}` : "Start at the unit"}
          {sheet.endTime ? `, back by ${sheet.endTime}` : ""} · {served} of {sheet.stops.length} stops done
        </p>
      </div>
      {sheet.stops.length === 0 && <p className="text-sm text-muted">This run has no stops.</p>}
      <ol className="space-y-3" data-testid="run-stops">
        {sheet.stops.map((stop) => (
          <li key={stop.id}>
            <StopCard runId={sheet.runId} stop={stop} next={stop.id === next?.id} />
          </li>
        ))}
      </ol>
    </section>
  );
}

function StopCard({ runId, stop, next }: { runId: number; stop: RunSheetStop; next: boolean }) {
  const toDeliver = stop.deliver.filter((s) => !s.done);
  const toCollect = stop.collect.filter((s) => !s.done);
  return (
    <Link
      href={`/driver/runs/${runId}/stops/${stop.id}`}
      data-testid="run-stop"
      className={cn(
        "block rounded-card border bg-surface px-4 py-3 shadow-card active:bg-lagoon-50",
        next ? "border-2 border-lagoon-600" : "border-line",
        stop.status !== "planned" && "opacity-75",
      )}
    >
      <div className="flex items-start gap-3">
        <span
          className={cn(
            "flex h-9 w-9 shrink-0 items-center justify-center rounded-full text-base font-semibold",
            stop.status === "planned" ? "bg-lagoon-700 text-white" : "bg-paper text-ink-soft",
          )}
          aria-label={`Stop ${stop.position}`}
        >
          {stop.position}
        </span>
        <div className="min-w-0 flex-1 space-y-1">
          <div className="flex flex-wrap items-center gap-2">
            <p className="text-base font-semibold text-ink">{stop.siteName}</p>
            {stop.status === "served" && <Badge tone="ok">Signed off</Badge>}
            {stop.status === "not_served" && <Badge tone="warn">Not served</Badge>}
            {next && <Badge tone="info">Next</Badge>}
          </div>
          <p className="flex items-start gap-1.5 text-sm text-ink-soft">
            <MapPin className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
            {stop.address}
          </p>
          <p className="flex items-center gap-1.5 text-sm text-ink-soft">
            <Clock className="h-4 w-4 shrink-0" aria-hidden="true" />
            {stop.plannedTime ? `${stop.plannedTime} · ` : ""}window {stop.window}
          </p>
          {stop.deliver.length > 0 && (
            <SetLine icon="deliver" label="Hand over" sets={stop.deliver.map((s) => `${s.typeName} (${s.serial})`)} left={toDeliver.length} />
          )}
          {stop.collect.length > 0 && (
            <SetLine icon="collect" label="Collect" sets={stop.collect.map((s) => `${s.typeName} (${s.serial})`)} left={toCollect.length} />
          )}
        </div>
        <ChevronRight className="mt-2 h-5 w-5 shrink-0 text-muted" aria-hidden="true" />
      </div>
    </Link>
  );
}

function SetLine({ icon, label, sets, left }: { icon: "deliver" | "collect"; label: string; sets: string[]; left: number }) {
  const Icon = icon === "deliver" ? PackageCheck : PackageOpen;
  return (
    <div className="text-sm">
      <p className="flex items-center gap-1.5 font-medium text-ink">
        <Icon className="h-4 w-4 shrink-0 text-lagoon-700" aria-hidden="true" />
        {label} {sets.length}
        {left !== sets.length && <span className="font-normal text-muted">({left} left)</span>}
      </p>
      <ul className="ml-6 list-disc text-ink-soft">
        {sets.map((s) => (
          <li key={s}>{s}</li>
        ))}
      </ul>
    </div>
  );
}
