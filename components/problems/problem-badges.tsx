import { Badge } from "@/components/ui/badge";
import type { ProblemKind } from "@/db/schema";
import { PROBLEM_KIND_SHORT, PROBLEM_STATUS_LABELS, type ProblemStatus } from "@/lib/problems/schemas";

export function ProblemStatusBadge({ status }: { status: ProblemStatus }) {
  return <Badge tone={status === "open" ? "warn" : "ok"}>{PROBLEM_STATUS_LABELS[status]}</Badge>;
}

export function ProblemKindBadge({ kind }: { kind: ProblemKind }) {
  return <Badge tone={kind === "wet_or_torn_pack" ? "danger" : kind === "other" ? "neutral" : "info"}>{PROBLEM_KIND_SHORT[kind]}</Badge>;
}
