import { Pencil, Plus } from "lucide-react";
import Link from "next/link";
import { notFound } from "next/navigation";
import type { ReactNode } from "react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { BatchStatusBadge } from "@/components/washing/batch-status-badge";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { formatBelow } from "@/lib/cycles/format";
import { AppError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { describeChamber, stuThatFit } from "@/lib/machines/chamber";
import { getMachine, type MachineDetail } from "@/lib/machines/service";
import { listBatches } from "@/lib/washing/service";
import { MachineDialog } from "./machine-dialog";
import { ProgramDialog } from "./program-dialog";

async function loadOr404(rawId: string): Promise<MachineDetail> {
  if (!/^[1-9][0-9]{0,15}$/.test(rawId)) notFound();
  try {
    return await getMachine(getDb(), Number(rawId));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

function Row({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="grid grid-cols-[9rem_1fr] gap-3 py-2">
      <dt className="text-sm text-muted">{label}</dt>
      <dd className="text-sm text-ink">{children}</dd>
    </div>
  );
}

/**
 * One machine: its details, its programs and, per kind, its runs. Each kind's section is a card of
 * its own below the programs (washers: their latest batches), so the steriliser's daily tests and
 * the monitoring log can join as further cards.
 */
export async function MachinePage({ user, rawId }: { user: SessionUser; rawId: string }) {
  const machine = await loadOr404(rawId);
  const manage = can(user.role, "machines.manage");
  const sections: ReactNode[] = [];
  if (machine.kind === "washer") sections.push(<WasherBatchesCard key="batches" machine={machine} />);

  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/machines" className="text-lagoon-700 underline-offset-2 hover:underline">
          ← All machines
        </Link>
      </p>
      <PageHeader
        title={`${machine.code} · ${machine.name}`}
        description={machine.kindLabel}
        actions={
          manage && (
            <MachineDialog
              machine={{
                id: machine.id,
                kind: machine.kind,
                code: machine.code,
                name: machine.name,
                serialNumber: machine.serialNumber,
                capacityStu: machine.capacityStu,
                chamber: machine.chamber,
                active: machine.active,
                programCount: machine.programCount,
              }}
              trigger={
                <Button variant="secondary">
                  <Pencil className="h-4 w-4" aria-hidden="true" /> Edit machine
                </Button>
              }
            />
          )
        }
      />
      <div className="grid gap-6 lg:grid-cols-[2fr_3fr]">
        <Card>
          <CardHeader title="Details" />
          <CardBody>
            <dl className="divide-y divide-line">
              <Row label="Kind">{machine.kindLabel}</Row>
              <Row label="Code">{machine.code}</Row>
              <Row label="Serial number">{machine.serialNumber ?? "—"}</Row>
              <Row label="Capacity">{machine.capacityStu === null ? "—" : `${machine.capacityStu} StU`}</Row>
              <Row label="Chamber">
                {machine.chamber ? `${describeChamber(machine.chamber)}; ${stuThatFit(machine.chamber)} whole StU fit` : "—"}
              </Row>
              <Row label="Status">
                <Badge tone={machine.active ? "ok" : "neutral"}>{machine.active ? "In use" : "Switched off"}</Badge>
              </Row>
              {machine.openRun && (
                <Row label={machine.openRun.kind === "batch" ? "Open batch" : "Open load"}>
                  <Link
                    href={machine.openRun.kind === "batch" ? `/unit/batches/${machine.openRun.id}` : `/unit/loads/${machine.openRun.id}`}
                    className="text-lagoon-700 underline-offset-2 hover:underline"
                  >
                    {machine.openRun.number}
                  </Link>{" "}
                  <BatchStatusBadge status={machine.openRun.status} />
                </Row>
              )}
              <Row label="Recorded">{formatDateTime(machine.createdAt)}</Row>
            </dl>
          </CardBody>
        </Card>
        <Card>
          <CardHeader
            title="Programs"
            description={machine.kind === "washer" ? "Each washer batch is checked against its program's requirement (advisory)." : undefined}
            action={
              manage && (
                <ProgramDialog
                  machineId={machine.id}
                  machineKind={machine.kind}
                  trigger={
                    <Button size="sm" className="shrink-0 whitespace-nowrap">
                      <Plus className="h-4 w-4" aria-hidden="true" /> Add a program
                    </Button>
                  }
                />
              )
            }
          />
          {machine.programs.length === 0 ? (
            <CardBody className="text-sm text-muted">No programs yet.</CardBody>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <caption className="sr-only">Programs of {machine.code}</caption>
                <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
                  <tr>
                    <th scope="col" className="px-4 py-2 font-semibold">Code</th>
                    <th scope="col" className="px-4 py-2 font-semibold">Name</th>
                    <th scope="col" className="px-4 py-2 font-semibold">Requirement</th>
                    <th scope="col" className="px-4 py-2 font-semibold">Status</th>
                    {manage && (
                      <th scope="col" className="px-4 py-2">
                        <span className="sr-only">Edit</span>
                      </th>
                    )}
                  </tr>
                </thead>
                <tbody className="divide-y divide-line" data-testid="programs">
                  {machine.programs.map((p) => (
                    <tr key={p.id}>
                      <td className="whitespace-nowrap px-4 py-3 font-medium">{p.code}</td>
                      <td className="px-4 py-3">{p.name}</td>
                      <td className="px-4 py-3 text-ink-soft">{p.requirementText}</td>
                      <td className="whitespace-nowrap px-4 py-3">
                        <Badge tone={p.active ? "ok" : "neutral"}>{p.active ? "In use" : "Switched off"}</Badge>
                      </td>
                      {manage && (
                        <td className="px-4 py-3 text-right">
                          <ProgramDialog
                            machineId={machine.id}
                            machineKind={machine.kind}
                            program={{ id: p.id, code: p.code, name: p.name, active: p.active, requirement: p.requirement }}
                            trigger={
                              <Button size="sm" variant="ghost" aria-label={`Edit program ${p.code}`}>
                                <Pencil className="h-4 w-4" aria-hidden="true" /> Edit
                              </Button>
                            }
                          />
                        </td>
                      )}
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>
      </div>
      {sections.length > 0 && <div className="mt-6 space-y-6">{sections}</div>}
    </>
  );
}

async function WasherBatchesCard({ machine }: { machine: MachineDetail }) {
  const latest = await listBatches(getDb(), { page: 1, pageSize: 8, sort: "created_at", dir: "desc", machineId: machine.id });
  return (
    <Card>
      <CardHeader
        title="Latest batches"
        description={`${latest.total} batch${latest.total === 1 ? "" : "es"} on ${machine.code} so far.`}
        action={
          <Link href={`/unit/batches?machine=${machine.id}`} className="text-sm font-medium text-lagoon-700 underline">
            All of {machine.code}&apos;s batches
          </Link>
        }
      />
      {latest.rows.length === 0 ? (
        <CardBody className="text-sm text-muted">No batches yet.</CardBody>
      ) : (
        <ul className="divide-y divide-line">
          {latest.rows.map((b) => (
            <li key={b.id} className="flex flex-wrap items-center justify-between gap-2 px-5 py-3 text-sm">
              <span>
                <Link href={`/unit/batches/${b.id}`} className="font-medium text-lagoon-700 underline-offset-2 hover:underline">
                  {b.number}
                </Link>
                <span className="text-muted">
                  {" "}
                  · {b.programName} · {formatDateTime(b.startedAt ?? b.createdAt)} · {b.itemCount} set{b.itemCount === 1 ? "" : "s"}
                  {b.a0 !== null ? ` · A0 ${formatBelow(b.a0, 0)}` : ""}
                </span>
              </span>
              <BatchStatusBadge status={b.status} />
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
