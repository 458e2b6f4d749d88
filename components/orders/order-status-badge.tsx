import { Badge, type BadgeTone } from "@/components/ui/badge";
import { ORDER_STATUS_LABELS } from "@/lib/orders/schemas";
import type { OrderStatus } from "@/db/schema";

const TONES: Record<OrderStatus, BadgeTone> = {
  booked: "neutral",
  collected: "info",
  in_process: "info",
  ready: "ok",
  out_for_delivery: "ok",
  delivered: "ok",
  cancelled: "neutral",
};

export function OrderStatusBadge({ status }: { status: OrderStatus }) {
  return <Badge tone={TONES[status]}>{ORDER_STATUS_LABELS[status]}</Badge>;
}
