import { AlertTriangle } from "lucide-react";
import Link from "next/link";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { formatDateTime } from "@/lib/format";
import type { MonitoringWarnings } from "@/lib/monitoring/service";
import { RECENT_WARNING_DAYS } from "@/lib/monitoring/service";

// The unit home's panel of monitoring warnings: machines out of use, readings out of range in the
// last days, and recurring checks that are overdue, each linking to the log.

export function MonitoringWarningsPanel({ warnings, timeZone }: { warnings: MonitoringWarnings; timeZone: string }) {
  const count = warnings.openFaults.length + warnings.outOfRange.length + warnings.overdue.length;
  if (count === 0) return null;
  return (
    <Card className="mb-8 border-danger-600/40" data-testid="monitoring-warnings">
      <CardHeader
        title="Monitoring warnings"
        description="Advisory: what follows from each is for the unit's procedures and qualified staff to decide."
        action={
          <Link href="/unit/monitoring" className="shrink-0 text-sm font-medium text-lagoon-700 underline">
            Open the log
          </Link>
        }
      />
      <CardBody className="p-0">
        <ul className="divide-y divide-line text-sm">
          {warnings.openFaults.map((f) => (
            <li key={`fault-${f.id}`} className="flex gap-3 px-5 py-3">
              <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0 text-danger-700" aria-hidden="true" />
              <span>
                <span className="font-semibold">Out of use:</span> {f.machine?.code} · {f.machine?.name}, fault recorded {formatDateTime(f.at, timeZone)}
                {f.notes ? ` — ${f.notes}` : ""}{" "}
                <Link href={`/unit/monitoring?kind=fault${f.machine ? `&machine=${f.machine.id}` : ""}`} className="text-lagoon-700 underline">
                  the fault
                </Link>
              </span>
            </li>
          ))}
          {warnings.outOfRange.map((e) => (
            <li key={`range-${e.id}`} className="flex gap-3 px-5 py-3">
              <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0 text-danger-700" aria-hidden="true" />
              <span>
                <span className="font-semibold">Out of range:</span> {e.findings.join(" ")}{" "}
                <span className="text-muted">
                  ({e.kindLabel}
                  {e.machine ? `, ${e.machine.code}` : e.place ? `, ${e.place}` : ""}, {formatDateTime(e.at, timeZone)})
                </span>{" "}
                <Link href={`/unit/monitoring?kind=${e.kind}&flagged=1`} className="text-lagoon-700 underline">
                  in the log
                </Link>
              </span>
            </li>
          ))}
          {warnings.overdue.map((c) => (
            <li key={`due-${c.check}-${c.machine?.id ?? "unit"}`} className="flex gap-3 px-5 py-3">
              <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0 text-warn-700" aria-hidden="true" />
              <span>
                <span className="font-semibold">Overdue:</span> {c.label}
                {c.machine ? ` on ${c.machine.code}` : ""}, due {c.state.dueOn ?? "now"}; last done {c.lastAt ? formatDateTime(c.lastAt, timeZone) : "never"}.{" "}
                <Link
                  href={`/unit/monitoring?kind=${c.check}${c.machine ? `&machine=${c.machine.id}` : ""}`}
                  className="text-lagoon-700 underline"
                >
                  in the log
                </Link>
              </span>
            </li>
          ))}
        </ul>
        <p className="border-t border-line px-5 py-2 text-xs text-muted">Readings out of range in the last {RECENT_WARNING_DAYS} days are listed.</p>
      </CardBody>
    </Card>
  );
}
