import { Badge } from "@/components/ui/badge";
import type { WasherBatchStatus } from "@/db/schema";
import { BATCH_STATUS_LABELS, BATCH_STATUS_TONES } from "@/lib/washing/status";

export function BatchStatusBadge({ status }: { status: WasherBatchStatus }) {
  return <Badge tone={BATCH_STATUS_TONES[status]}>{BATCH_STATUS_LABELS[status]}</Badge>;
}
