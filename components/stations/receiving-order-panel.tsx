"use client";

import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Dialog, DialogClose, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { cn } from "@/lib/cn";
import type { ReceivingOrder, ReceivingOrderSet } from "@/lib/stations/receiving-shared";

// The order being received: its booked sets ticked off as they arrive, those that came unbooked,
// and the button that finishes it (reporting what did not come).

function mark(s: ReceivingOrderSet): { symbol: string; text: string; className: string } {
  if (s.unexpected) return { symbol: "!", text: "Came without a booking", className: "text-warn-700" };
  if (s.received) return { symbol: "✓", text: "Received", className: "text-ok-700" };
  if (s.missing) return { symbol: "✕", text: "Reported missing", className: "text-danger-700" };
  return { symbol: "○", text: "Expected", className: "text-muted" };
}

export function ReceivingOrderPanel({
  order,
  fmt,
  busy,
  onFinish,
  highlightCycleId,
}: {
  order: ReceivingOrder;
  fmt: (iso: string | null) => string;
  busy: boolean;
  onFinish: () => void;
  highlightCycleId: number | null;
}) {
  const expected = order.sets.filter((s) => !s.unexpected && !s.received && !s.missing);
  return (
    <Card data-testid="receiving-order">
      <CardHeader
        title={`Pickup ${order.reference}`}
        description={`${order.customerName} · ${order.siteName}`}
        action={order.serviceLevel === "express" ? <Badge tone="warn">Express</Badge> : <Badge tone="neutral">Standard</Badge>}
      />
      <CardBody className="space-y-4">
        <div className="flex flex-wrap items-end justify-between gap-3">
          <p className="text-3xl font-semibold tabular-nums text-ink" data-testid="receiving-order-progress">
            {order.received} of {order.booked} received
          </p>
          <p className="text-sm text-muted">
            Promised back by <span className="font-medium text-ink tabular-nums">{fmt(order.promisedReturnAt)}</span>
          </p>
        </div>
        <ul className="divide-y divide-line rounded-lg border border-line" aria-label={`Sets of ${order.reference}`}>
          {order.sets.map((s) => {
            const m = mark(s);
            return (
              <li
                key={s.cycleId}
                className={cn("flex items-center gap-3 px-4 py-3", s.cycleId === highlightCycleId && "bg-lagoon-50")}
                data-testid="receiving-order-set"
              >
                <span aria-hidden="true" className={cn("w-5 text-center text-xl font-semibold", m.className)}>
                  {m.symbol}
                </span>
                <span className="min-w-0 flex-1">
                  <span className="block font-medium tabular-nums text-ink">{s.serial}</span>
                  <span className="block truncate text-sm text-muted">{s.setName}</span>
                </span>
                <span className={cn("text-sm font-medium", m.className)}>{m.text}</span>
              </li>
            );
          })}
        </ul>
        <Dialog>
          <DialogTrigger asChild>
            <Button size="lg" variant={expected.length ? "accent" : "primary"} className="w-full" disabled={busy}>
              Finish receiving this order
            </Button>
          </DialogTrigger>
          <DialogContent
            title={`Finish receiving ${order.reference}?`}
            description={
              expected.length
                ? `${expected.length} booked ${expected.length === 1 ? "set has" : "sets have"} not arrived. ${expected.length === 1 ? "It" : "They"} will be reported missing to ${order.siteName}, by e-mail and on the order's page.`
                : "Every booked set has arrived."
            }
          >
            {expected.length > 0 && (
              <ul className="mb-5 space-y-1 text-sm">
                {expected.map((s) => (
                  <li key={s.cycleId}>
                    <span aria-hidden="true">✕ </span>
                    <span className="font-medium">{s.serial}</span> — {s.setName}
                  </li>
                ))}
              </ul>
            )}
            <div className="flex flex-wrap justify-end gap-3">
              <DialogClose asChild>
                <Button size="lg" variant="secondary">
                  Keep receiving
                </Button>
              </DialogClose>
              <DialogClose asChild>
                <Button size="lg" variant={expected.length ? "danger" : "primary"} onClick={onFinish}>
                  {expected.length ? "Report missing and finish" : "Finish"}
                </Button>
              </DialogClose>
            </div>
          </DialogContent>
        </Dialog>
      </CardBody>
    </Card>
  );
}
