import { AlertTriangle } from "lucide-react";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { CYCLE_STATE_LABELS, MAIN_LINE } from "@/lib/cycles/lifecycle";
import { formatDateTime } from "@/lib/format";
import type { OrderDetail } from "@/lib/orders/service";

const EXCEPTIONS = ["on_hold", "reprocess", "recalled"];

/** One order: its times, and each set's way through the unit. */
export function OrderDetailView({ order, timeZone }: { order: OrderDetail; timeZone: string }) {
  const fmt = (iso: string | null) => formatDateTime(iso, timeZone);
  return (
    <div className="space-y-6">
      <div className="grid gap-4 md:grid-cols-4">
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Collection window</p>
            <p className="mt-1 font-medium tabular-nums">
              {fmt(order.collectionFrom)} – {order.collectionUntil ? formatDateTime(order.collectionUntil, timeZone).split(", ").pop() : ""}
            </p>
            {order.collectedAt && <p className="text-xs text-muted">Collected {fmt(order.collectedAt)}</p>}
          </CardBody>
        </Card>
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Needed back by</p>
            <p className="mt-1 font-medium tabular-nums">{fmt(order.neededBackBy)}</p>
          </CardBody>
        </Card>
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Promised back by</p>
            <p className="mt-1 font-medium tabular-nums" data-testid="order-promised">
              {fmt(order.promisedReturnAt)}
            </p>
            <p className="text-xs text-muted">{order.serviceLevel === "express" ? "Express" : "Standard"} turnaround</p>
          </CardBody>
        </Card>
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Flags</p>
            <div className="mt-1 flex flex-wrap gap-1">
              {order.heavySoil && <Badge tone="warn">Heavy soil</Badge>}
              {order.outOfHours && <Badge tone="info">Out of hours</Badge>}
              {!order.heavySoil && !order.outOfHours && <span className="text-sm">None</span>}
            </div>
          </CardBody>
        </Card>
      </div>
      {order.notes && (
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Notes</p>
            <p className="mt-1 whitespace-pre-wrap text-sm">{order.notes}</p>
          </CardBody>
        </Card>
      )}
      <Card>
        <CardHeader title={`Sets (${order.sets})`} description="Each set's steps, with the time it reached each one." />
        <CardBody className="p-0">
          <ul className="divide-y divide-line">
            {order.cycles.map((c) => {
              const reached = new Map(c.times.map((t) => [t.state, t.at]));
              return (
                <li key={c.cycleId} className="px-5 py-4" data-testid="order-set">
                  <div className="flex flex-wrap items-center justify-between gap-2">
                    <p className="font-medium">
                      {c.setName} <span className="font-normal text-muted">{c.serial}</span>
                    </p>
                    <Badge tone={EXCEPTIONS.includes(c.state) ? "warn" : c.state === "cancelled" ? "neutral" : "info"}>{c.stateLabel}</Badge>
                  </div>
                  {EXCEPTIONS.includes(c.state) && (
                    <p className="mt-2 flex gap-2 rounded-lg bg-warn-50 px-3 py-2 text-sm text-warn-700">
                      <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                      {c.state === "on_hold"
                        ? `On hold at the unit${c.holdReason ? `: ${c.holdReason}` : ""}. The unit will contact you if the return time changes.`
                        : c.state === "reprocess"
                          ? "Being washed again; this may delay its return."
                          : "Recalled: the unit will tell you what to do with it."}
                    </p>
                  )}
                  {c.state !== "cancelled" && (
                    <ol className="mt-3 grid grid-cols-3 gap-2 text-xs sm:grid-cols-5 lg:grid-cols-9" aria-label={`Steps of ${c.serial}`}>
                      {MAIN_LINE.map((state) => {
                        const at = reached.get(state);
                        return (
                          <li key={state} className={`rounded-md border px-2 py-1.5 ${at ? "border-lagoon-200 bg-lagoon-50" : "border-line text-muted"}`}>
                            <span className="block font-medium">
                              <span aria-hidden="true">{at ? "● " : "○ "}</span>
                              {CYCLE_STATE_LABELS[state]}
                            </span>
                            <span className="tabular-nums">{at ? fmt(at) : "—"}</span>
                          </li>
                        );
                      })}
                    </ol>
                  )}
                </li>
              );
            })}
            {order.extras.map((e, i) => (
              <li key={`extra-${i}`} className="px-5 py-3 text-sm">
                {e.quantity} × {e.description} <span className="text-muted">(no barcode)</span>
              </li>
            ))}
          </ul>
        </CardBody>
      </Card>
    </div>
  );
}
