import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody } from "@/components/ui/card";
import { formatDateTime } from "@/lib/format";
import type { RecallListRow } from "@/lib/sterilising/recalls";

/** Recalls as a list, each linking to its page under `base`. */
export function RecallList({ recalls, base }: { recalls: RecallListRow[]; base: string }) {
  if (recalls.length === 0) {
    return (
      <Card>
        <CardBody className="py-10 text-center text-lg text-muted">No recalls.</CardBody>
      </Card>
    );
  }
  return (
    <Card>
      <ul className="divide-y divide-line" data-testid="recall-list">
        {recalls.map((r) => (
          <li key={r.id} className="flex flex-wrap items-center justify-between gap-3 px-5 py-3 text-sm">
            <div>
              <Link href={`${base}/${r.id}`} className="font-semibold text-lagoon-700 underline-offset-2 hover:underline">
                Recall {r.number}
              </Link>
              <p className="text-muted">
                Load {r.loadNumber} · {formatDateTime(r.createdAt)} · {r.reason}
              </p>
            </div>
            <div className="flex items-center gap-2">
              <span className="text-muted">
                {r.sets} set{r.sets === 1 ? "" : "s"}, {r.outstanding} not back
              </span>
              <Badge tone={r.status === "open" ? "danger" : "ok"}>{r.status === "open" ? "Open" : "Closed"}</Badge>
            </div>
          </li>
        ))}
      </ul>
    </Card>
  );
}
