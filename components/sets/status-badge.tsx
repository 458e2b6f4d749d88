import { Badge } from "@/components/ui/badge";
import { SET_STATUS_LABELS, type SetStatus } from "@/lib/sets/schemas";

/** A set's status as a badge: in service or retired. */
export function SetStatusBadge({ status }: { status: SetStatus }) {
  return <Badge tone={status === "in_service" ? "ok" : "neutral"}>{SET_STATUS_LABELS[status]}</Badge>;
}
