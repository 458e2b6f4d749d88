import { Badge, type BadgeTone } from "@/components/ui/badge";
import type { ContractStatus } from "@/lib/contracts/dates";
import { CONTRACT_STATUS_LABELS } from "@/lib/contracts/format";

const TONES: Record<ContractStatus, BadgeTone> = { current: "ok", upcoming: "info", ended: "neutral" };

/** Whether a version is in force today, starts later, or has ended. */
export function ContractStatusBadge({ status }: { status: ContractStatus }) {
  return <Badge tone={TONES[status]}>{CONTRACT_STATUS_LABELS[status]}</Badge>;
}
