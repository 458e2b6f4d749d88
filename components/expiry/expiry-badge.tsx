import { Badge } from "@/components/ui/badge";
import { expiryPhrase } from "@/lib/expiry/dates";
import type { ExpiringSetRow } from "@/lib/expiry/service";

/** "Expired 2 days ago" (danger), "Expires today" (warn), "Expires in 5 days" (info). */
export function ExpiryBadge({ row }: { row: Pick<ExpiringSetRow, "status" | "daysLeft"> }) {
  const tone = row.status === "expired" ? "danger" : row.status === "today" || row.daysLeft <= 3 ? "warn" : "info";
  return <Badge tone={tone}>{expiryPhrase(row.daysLeft)}</Badge>;
}
