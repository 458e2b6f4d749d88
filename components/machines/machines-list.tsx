import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { Card, CardHeader } from "@/components/ui/card";
import { BatchStatusBadge } from "@/components/washing/batch-status-badge";
import type { MachineKind } from "@/db/schema";
import { MACHINE_KIND_PLURALS, MACHINE_KINDS } from "@/lib/machines/requirements";
import type { MachineListRow } from "@/lib/machines/service";

/** The machines grouped by kind, one table per kind. */
export function MachinesList({ machines }: { machines: MachineListRow[] }) {
  if (machines.length === 0) {
    return <p className="text-sm text-muted">No machines yet.</p>;
  }
  const kinds = MACHINE_KINDS.filter((k) => machines.some((m) => m.kind === k));
  return (
    <div className="space-y-6">
      {kinds.map((kind: MachineKind) => (
        <Card key={kind}>
          <CardHeader title={MACHINE_KIND_PLURALS[kind]} />
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">{MACHINE_KIND_PLURALS[kind]}</caption>
              <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th scope="col" className="px-4 py-2 font-semibold">Code</th>
                  <th scope="col" className="px-4 py-2 font-semibold">Name</th>
                  <th scope="col" className="px-4 py-2 font-semibold">Serial number</th>
                  <th scope="col" className="px-4 py-2 font-semibold">Capacity</th>
                  <th scope="col" className="px-4 py-2 font-semibold">Programs</th>
                  <th scope="col" className="px-4 py-2 font-semibold">Status</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {machines
                  .filter((m) => m.kind === kind)
                  .map((m) => (
                    <tr key={m.id} className="hover:bg-paper/50">
                      <td className="px-4 py-3">
                        <Link href={`/unit/machines/${m.id}`} className="font-medium text-lagoon-700 underline-offset-2 hover:underline">
                          {m.code}
                        </Link>
                      </td>
                      <td className="px-4 py-3">{m.name}</td>
                      <td className="px-4 py-3 text-muted">{m.serialNumber ?? "—"}</td>
                      <td className="px-4 py-3 tabular-nums">{m.capacityStu === null ? "—" : `${m.capacityStu} StU`}</td>
                      <td className="px-4 py-3 tabular-nums">{m.programCount}</td>
                      <td className="space-x-2 whitespace-nowrap px-4 py-3">
                        <Badge tone={m.active ? "ok" : "neutral"}>{m.active ? "In use" : "Switched off"}</Badge>
                        {m.openRun && (
                          <span className="whitespace-nowrap text-xs text-muted">
                            <BatchStatusBadge status={m.openRun.status} /> {m.openRun.number}
                          </span>
                        )}
                      </td>
                    </tr>
                  ))}
              </tbody>
            </table>
          </div>
        </Card>
      ))}
    </div>
  );
}
