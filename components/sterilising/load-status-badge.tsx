import type { LoadStatus } from "@/db/schema";
import { Badge } from "@/components/ui/badge";
import { LOAD_STATUS_LABELS, LOAD_STATUS_TONES } from "@/lib/sterilising/status";

export function LoadStatusBadge({ status }: { status: LoadStatus }) {
  return <Badge tone={LOAD_STATUS_TONES[status]}>{LOAD_STATUS_LABELS[status]}</Badge>;
}
