import { CircleAlert } from "lucide-react";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { formatDateTime } from "@/lib/format";
import type { OrderNoticeView } from "@/lib/stations/receiving";

const KIND = {
  unexpected_set: { mark: "!", label: "Arrived without a booking", className: "bg-warn-50 text-warn-700 border-warn-600/30" },
  missing_set: { mark: "✕", label: "Did not arrive", className: "bg-danger-50 text-danger-700 border-danger-600/30" },
} as const;

/** What the unit's receiving reported about an order's sets, on the clinic's order page. */
export function ReceivingNotices({ notices, timeZone }: { notices: OrderNoticeView[]; timeZone: string }) {
  if (notices.length === 0) return null;
  return (
    <Card className="mb-6" data-testid="order-notices">
      <CardHeader title="From the unit's receiving" description="Sets that came without a booking, or that were booked and did not arrive." />
      <CardBody className="p-0">
        <ul className="divide-y divide-line">
          {notices.map((n) => {
            const kind = KIND[n.kind];
            return (
              <li key={n.id} className="flex gap-3 px-5 py-4" data-testid="order-notice">
                <CircleAlert className="mt-0.5 h-5 w-5 shrink-0 text-warn-700" aria-hidden="true" />
                <div className="min-w-0 space-y-1">
                  <p className="flex flex-wrap items-center gap-2">
                    <span className={`inline-flex items-center gap-1 rounded-full border px-2 py-0.5 text-xs font-medium ${kind.className}`}>
                      <span aria-hidden="true">{kind.mark}</span>
                      {kind.label}
                    </span>
                    <span className="font-medium">{n.serial}</span>
                    <span className="text-sm text-muted">{n.setName}</span>
                  </p>
                  <p className="text-sm">{n.message}</p>
                  <p className="text-xs text-muted">{formatDateTime(n.createdAt, timeZone)}</p>
                </div>
              </li>
            );
          })}
        </ul>
      </CardBody>
    </Card>
  );
}
