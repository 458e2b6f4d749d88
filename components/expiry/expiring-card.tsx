import Link from "next/link";
import { Card, CardHeader } from "@/components/ui/card";
import { formatLocalDate } from "@/lib/expiry/dates";
import type { ExpiringList } from "@/lib/expiry/service";
import { ExpiryBadge } from "./expiry-badge";

const SHOWN = 5;

/** The clinic home's card: the first few sets nearing expiry and a link to the full list. */
export function ExpiringCard({ list }: { list: ExpiringList }) {
  const rows = list.rows.slice(0, SHOWN);
  return (
    <Card className="mb-8">
      <CardHeader
        title="Sets nearing expiry"
        description={
          list.rows.length === 0
            ? `No delivered set expires within ${list.days} days.`
            : `${list.rows.length} ${list.rows.length === 1 ? "set expires" : "sets expire"} within ${list.days} days or already expired.`
        }
        action={
          <Link href="/clinic/expiring" className="shrink-0 text-sm font-medium text-lagoon-700 underline">
            See all
          </Link>
        }
      />
      {rows.length > 0 && (
        <ul className="divide-y divide-line">
          {rows.map((r) => (
            <li key={r.cycleId} className="flex flex-wrap items-center justify-between gap-2 px-5 py-3 text-sm">
              <span>
                <span className="font-medium text-ink">{r.serial}</span> <span className="text-ink-soft">{r.setName}</span>
              </span>
              <span className="flex items-center gap-2 text-muted">
                <ExpiryBadge row={r} />
                {formatLocalDate(r.expiresOn)}
              </span>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
