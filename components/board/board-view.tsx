"use client";

import { useQuery } from "@tanstack/react-query";
import {
  CirclePause,
  Droplets,
  Maximize,
  Minimize,
  Package,
  PackageCheck,
  RotateCcw,
  Send,
  ShieldCheck,
  Thermometer,
  TriangleAlert,
  Truck,
  type LucideIcon,
} from "lucide-react";
import { useEffect, useState } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { BoardState } from "@/lib/board/definitions";
import type { BoardCycle, BoardGroup, UnitBoard } from "@/lib/board/service";
import { cn } from "@/lib/cn";
import { fetchJson } from "@/lib/fetch-json";
import { formatDateTime } from "@/lib/format";

// The unit's board, for a wall screen: large numbers per station, what is overdue and on hold,
// by service level (express first) and by customer. Refreshes every 15 seconds.

const REFRESH_MS = 15_000;

const ICONS: Record<BoardState, LucideIcon> = {
  collected: Truck,
  received: PackageCheck,
  washed: Droplets,
  packed: Package,
  sterilised: Thermometer,
  released: ShieldCheck,
  dispatched: Send,
  on_hold: CirclePause,
  reprocess: RotateCcw,
  recalled: TriangleAlert,
};

/** The sides of the flow, coloured while they hold a set (their icons and labels say it without colour). */
const EXCEPTION_TONE: Partial<Record<BoardState, string>> = {
  on_hold: "border-warn-600/50 bg-warn-50 text-warn-700",
  reprocess: "border-warn-600/50 bg-warn-50 text-warn-700",
  recalled: "border-danger-600/50 bg-danger-50 text-danger-700",
};

/** "12 min", "2 h 15 min", "3 d 4 h". */
export function lateBy(minutes: number): string {
  if (minutes < 60) return `${minutes} min`;
  const days = Math.floor(minutes / 1440);
  const hours = Math.floor((minutes % 1440) / 60);
  if (days > 0) return `${days} d ${hours} h`;
  const rest = minutes % 60;
  return rest ? `${hours} h ${rest} min` : `${hours} h`;
}

function useFullscreen() {
  const [on, setOn] = useState(false);
  useEffect(() => {
    const sync = () => setOn(!!document.fullscreenElement);
    document.addEventListener("fullscreenchange", sync);
    return () => document.removeEventListener("fullscreenchange", sync);
  }, []);
  const toggle = () => {
    if (document.fullscreenElement) void document.exitFullscreen();
    else void document.getElementById("unit-board")?.requestFullscreen();
  };
  return { on, toggle };
}

export function BoardView({ initial, timeZone }: { initial: UnitBoard; timeZone: string }) {
  const { data, error, isFetching, dataUpdatedAt } = useQuery({
    queryKey: ["unit-board"],
    queryFn: () => fetchJson<UnitBoard>("/api/board"),
    initialData: initial,
    initialDataUpdatedAt: Date.parse(initial.generatedAt),
    refetchInterval: REFRESH_MS,
    refetchIntervalInBackground: true,
    staleTime: 0,
  });
  const full = useFullscreen();
  const time = (iso: string | null) => formatDateTime(iso, timeZone);
  const updated = formatDateTime(new Date(dataUpdatedAt), timeZone).split(", ").pop();

  return (
    <div id="unit-board" className={cn("space-y-6", full.on && "overflow-y-auto bg-paper p-8")}>
      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-base text-muted" aria-live="polite" data-testid="board-updated">
          {error ? (
            <span className="font-medium text-warn-700">
              <span aria-hidden="true">! </span>Not updated since {updated}: {error.message} Retrying every 15 s.
            </span>
          ) : (
            <>
              Updated {updated}
              {isFetching ? " · refreshing…" : " · refreshes every 15 s"}
            </>
          )}
        </p>
        <Button variant="secondary" size="lg" onClick={full.toggle}>
          {full.on ? <Minimize className="h-5 w-5" aria-hidden="true" /> : <Maximize className="h-5 w-5" aria-hidden="true" />}
          {full.on ? "Leave full screen" : "Full screen"}
        </Button>
      </div>

      <section aria-label="At a glance" className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <Headline testId="board-overdue" label="Overdue" mark="✕" value={data.totals.overdue} hint="Past the promised time, not yet released" tone={data.totals.overdue ? "danger" : "ok"} />
        <Headline testId="board-due-soon" label="Due within 2 hours" mark="◷" value={data.totals.dueSoon} hint="Not yet released" tone={data.totals.dueSoon ? "warn" : "ok"} />
        <Headline testId="board-on-hold" label="On hold" mark="!" value={data.totals.onHold} hint="Quarantined, waiting for a decision" tone={data.totals.onHold ? "warn" : "ok"} />
        <Headline testId="board-express" label="Express in the flow" mark="◆" value={data.totals.express} hint={`of ${data.totals.sets} sets on the board`} tone="info" />
      </section>

      <section aria-labelledby="board-stations">
        <h2 id="board-stations" className="mb-3 text-lg font-semibold text-ink">
          Sets at each step now
        </h2>
        <ul className="grid grid-cols-2 gap-3 md:grid-cols-5">
          {data.columns.map((c) => {
            const Icon = ICONS[c.state];
            const tone = c.count > 0 ? EXCEPTION_TONE[c.state] : undefined;
            return (
              <li key={c.state} data-testid={`board-count-${c.state}`} className={cn("rounded-card border bg-surface p-4 shadow-card", tone ?? "border-line text-ink")}>
                <p className="flex items-center gap-2 text-base font-semibold">
                  <Icon className="h-6 w-6 shrink-0" aria-hidden="true" />
                  <span>{c.label}</span>
                </p>
                <p className="mt-2 text-6xl font-semibold leading-none tabular-nums" data-testid="board-count-value">
                  {c.count}
                </p>
                <p className="mt-2 text-sm opacity-80">
                  {c.express} express{c.overdue ? ` · ${c.overdue} overdue` : ""}
                </p>
                <p className="sr-only">{c.hint}</p>
              </li>
            );
          })}
        </ul>
      </section>

      <div className="grid gap-6 xl:grid-cols-2">
        <Card>
          <CardHeader title={`Overdue (${data.overdue.length})`} description="Express first, then the longest overdue. Late means after the promised return time." />
          <CardBody className="p-0">
            {data.overdue.length === 0 ? (
              <p className="px-5 py-6 text-lg text-ok-700">
                <span aria-hidden="true">✓ </span>Nothing is past its promised time.
              </p>
            ) : (
              <CycleTable rows={data.overdue} time={time} testId="board-overdue-list" extra={{ label: "Late by", cell: (r) => lateBy(r.overdueMinutes) }} />
            )}
          </CardBody>
        </Card>
        <Card>
          <CardHeader title={`On hold (${data.holds.length})`} description="Longest held first, with the reason recorded." />
          <CardBody className="p-0">
            {data.holds.length === 0 ? (
              <p className="px-5 py-6 text-lg text-ok-700">
                <span aria-hidden="true">✓ </span>No set is on hold.
              </p>
            ) : (
              <ul className="divide-y divide-line" data-testid="board-holds">
                {data.holds.map((h) => (
                  <li key={h.cycleId} className="px-5 py-3">
                    <p className="flex flex-wrap items-center gap-2 text-base">
                      <span className="font-semibold tabular-nums">{h.serial}</span>
                      <span className="text-ink-soft">{h.setName}</span>
                      {h.serviceLevel === "express" && <Badge tone="warn">Express</Badge>}
                    </p>
                    <p className="text-sm text-muted">
                      {h.customerName} · {h.siteName}
                      {h.since ? ` · held since ${time(h.since)}` : ""}
                      {h.heldFromLabel ? ` · from “${h.heldFromLabel}”` : ""}
                    </p>
                    <p className="mt-1 text-base text-warn-700">
                      <span aria-hidden="true">! </span>
                      {h.reason ?? "No reason recorded"}
                    </p>
                  </li>
                ))}
              </ul>
            )}
          </CardBody>
        </Card>
      </div>

      <div className="grid gap-6">
        <GroupTable title="By service level" description="Express first." groups={data.byLevel} columns={data.columns} testId="board-by-level" />
        <GroupTable title="By customer" groups={data.byCustomer} columns={data.columns} testId="board-by-customer" />
      </div>
      <p className="text-xs text-muted">
        Times are the unit&apos;s local time. Counts are of each set&apos;s current step as last scanned; release decisions stay with the unit&apos;s qualified staff and
        its validated procedures.
      </p>
    </div>
  );
}

const HEADLINE_TONE = {
  danger: "border-danger-600/50 bg-danger-50 text-danger-700",
  warn: "border-warn-600/50 bg-warn-50 text-warn-700",
  ok: "border-ok-600/40 bg-ok-50 text-ok-700",
  info: "border-lagoon-200 bg-lagoon-50 text-lagoon-800",
} as const;

function Headline({ label, value, hint, tone, mark, testId }: { label: string; value: number; hint: string; tone: keyof typeof HEADLINE_TONE; mark: string; testId: string }) {
  return (
    <div className={cn("rounded-card border p-5", HEADLINE_TONE[tone])} data-testid={testId}>
      <p className="flex items-center gap-2 text-lg font-semibold">
        <span aria-hidden="true">{tone === "ok" ? "✓" : mark}</span>
        {label}
      </p>
      <p className="mt-1 text-7xl font-semibold leading-none tabular-nums" data-testid="board-headline-value">
        {value}
      </p>
      <p className="mt-2 text-sm">{hint}</p>
    </div>
  );
}

function CycleTable({
  rows,
  time,
  extra,
  testId,
}: {
  rows: BoardCycle[];
  time: (iso: string | null) => string;
  extra: { label: string; cell: (r: BoardCycle) => string };
  testId: string;
}) {
  return (
    <div className="overflow-x-auto">
      <table className="w-full text-left text-base" data-testid={testId}>
        <thead className="border-b border-line text-sm text-muted">
          <tr>
            <th scope="col" className="px-5 py-2 font-medium">
              Set
            </th>
            <th scope="col" className="px-3 py-2 font-medium">
              Customer
            </th>
            <th scope="col" className="px-3 py-2 font-medium">
              Now
            </th>
            <th scope="col" className="px-3 py-2 font-medium">
              Promised
            </th>
            <th scope="col" className="px-5 py-2 text-right font-medium">
              {extra.label}
            </th>
          </tr>
        </thead>
        <tbody className="divide-y divide-line">
          {rows.map((r) => (
            <tr key={r.cycleId}>
              <td className="px-5 py-2.5">
                <span className="flex flex-wrap items-center gap-2">
                  <span className="font-semibold tabular-nums">{r.serial}</span>
                  {r.serviceLevel === "express" && <Badge tone="warn">Express</Badge>}
                </span>
                <span className="block text-sm text-muted">{r.setName}</span>
              </td>
              <td className="px-3 py-2.5 text-sm">
                {r.customerName}
                <span className="block text-muted">{r.orderReference ?? "no order"}</span>
              </td>
              <td className="px-3 py-2.5 text-sm">{r.stateLabel}</td>
              <td className="px-3 py-2.5 text-sm tabular-nums">{time(r.promisedAt)}</td>
              <td className="px-5 py-2.5 text-right font-semibold tabular-nums text-danger-700">
                <span aria-hidden="true">✕ </span>
                {extra.cell(r)}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

function GroupTable({
  title,
  description,
  groups,
  columns,
  testId,
}: {
  title: string;
  description?: string;
  groups: BoardGroup[];
  columns: UnitBoard["columns"];
  testId: string;
}) {
  return (
    <Card>
      <CardHeader title={title} description={description} />
      <CardBody className="p-0">
        {groups.length === 0 ? (
          <p className="px-5 py-6 text-muted">No sets on the board.</p>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm tabular-nums" data-testid={testId}>
              <thead className="border-b border-line text-muted">
                <tr>
                  <th scope="col" className="px-5 py-2 font-medium">
                    {title.replace("By ", "").replace(/^./, (c) => c.toUpperCase())}
                  </th>
                  <th scope="col" className="px-2 py-2 text-right font-medium">
                    All
                  </th>
                  <th scope="col" className="px-2 py-2 text-right font-medium text-danger-700">
                    Overdue
                  </th>
                  {columns.map((c) => (
                    <th key={c.state} scope="col" className="px-2 py-2 text-right font-medium">
                      {c.label}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {groups.map((g) => (
                  <tr key={g.key}>
                    <th scope="row" className="px-5 py-2 font-medium text-ink">
                      {g.label}
                    </th>
                    <td className="px-2 py-2 text-right font-semibold">{g.total}</td>
                    <td className={cn("px-2 py-2 text-right font-semibold", g.overdue ? "text-danger-700" : "text-muted")}>
                      {g.overdue ? `✕ ${g.overdue}` : "0"}
                    </td>
                    {columns.map((c) => (
                      <td key={c.state} className={cn("px-2 py-2 text-right", g.byState[c.state] ? "text-ink" : "text-muted")}>
                        {g.byState[c.state]}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </CardBody>
    </Card>
  );
}
