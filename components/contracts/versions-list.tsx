import Link from "next/link";
import { Card, CardHeader } from "@/components/ui/card";
import { formatValidity } from "@/lib/contracts/format";
import type { ContractListRow } from "@/lib/contracts/service";
import { ContractStatusBadge } from "./status-badge";

/** The versions of one customer's contract, newest first, each linking to its page. */
export function VersionsList({
  title,
  description,
  versions,
  hrefFor,
  currentId,
}: {
  title: string;
  description?: string;
  versions: ContractListRow[];
  hrefFor: (id: number) => string;
  currentId?: number;
}) {
  return (
    <Card>
      <CardHeader title={title} description={description} />
      {versions.length === 0 ? (
        <p className="px-5 py-4 text-sm text-muted">No other versions.</p>
      ) : (
        <ul className="divide-y divide-line">
          {versions.map((v) => (
            <li key={v.id} className="flex flex-wrap items-center justify-between gap-2 px-5 py-3 text-sm">
              <div>
                {v.id === currentId ? (
                  <span className="font-medium text-ink">{v.reference} (this page)</span>
                ) : (
                  <Link href={hrefFor(v.id)} className="font-medium text-lagoon-700 underline-offset-2 hover:underline">
                    {v.reference}
                  </Link>
                )}
                <p className="text-muted">{formatValidity(v.validFrom, v.validUntil)}</p>
              </div>
              <ContractStatusBadge status={v.status} />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
