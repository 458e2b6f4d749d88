import { ShieldAlert } from "lucide-react";
import Link from "next/link";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Input, Select } from "@/components/ui/input";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { serverEnv } from "@/lib/env";
import { formatDateTime } from "@/lib/format";
import { describeRange, LIMIT_INFO, LIMIT_KEYS } from "@/lib/monitoring/limits";
import type { DueStatus } from "@/lib/monitoring/schedule";
import { ENTRY_KIND_LABELS, ENTRY_KINDS, type EntryKind, type LogFilter, ROUTINE_KINDS } from "@/lib/monitoring/schemas";
import { checkStatuses, listEntries, loadSettings, machineOptions } from "@/lib/monitoring/service";
import { ClearFaultDialog } from "./clear-fault-dialog";
import { EntryForm } from "./entry-form";
import { SettingsForm } from "./settings-form";

// The monitoring and maintenance log: the recurring checks and when each is due, the form to
// record an entry, the log filtered by machine, kind and period, and the limits and intervals.

export const MONITORING_ADVISORY =
  "Limits and due dates here are advisory aids to the unit's own monitoring. What a reading out of range or a missed check means for machines, stored sets and their release follows the unit's validated procedures, the decision of qualified staff and local regulations.";

const DUE_TONES: Record<DueStatus, BadgeTone> = { done: "ok", due: "info", overdue: "danger" };
const DUE_WORDS: Record<DueStatus, string> = { done: "Done", due: "Due today", overdue: "Overdue" };

export async function MonitoringPage({ user, filter }: { user: SessionUser; filter: LogFilter }) {
  const db = getDb();
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const now = new Date();
  const settings = await loadSettings(db);
  const [entries, statuses, machines] = await Promise.all([
    listEntries(db, filter, timeZone),
    checkStatuses(db, now, timeZone, settings),
    machineOptions(db),
  ]);
  const manage = can(user.role, "machine_log.manage");
  const record = can(user.role, "machine_log.record");
  const kinds: EntryKind[] = manage ? [...ENTRY_KINDS] : ENTRY_KINDS.filter((k) => ROUTINE_KINDS.includes(k));
  const outOfUse = machines.filter((m) => m.outOfUse);
  const filtered = Boolean(filter.machine || filter.kind || filter.from || filter.to || filter.flagged);

  return (
    <>
      <PageHeader
        title="Monitoring and maintenance log"
        description="Cleaning, services, faults, seal tests, water treatment and sterile store readings, each checked against its limits."
      />
      <p className="mb-6 flex gap-2 rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700" data-testid="advisory-note">
        <ShieldAlert className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
        <span>{MONITORING_ADVISORY}</span>
      </p>

      {outOfUse.length > 0 && (
        <p className="mb-6 rounded-lg border border-danger-600/30 bg-danger-50 px-3 py-2 text-sm text-danger-700" role="status">
          Out of use with an open fault: {outOfUse.map((m) => `${m.code} (${m.name})`).join(", ")}.
        </p>
      )}

      <div className="grid gap-6 xl:grid-cols-[3fr_2fr]">
        <Card>
          <CardHeader title="Recurring checks" description="When each was last done, and whether it is due, on the unit's calendar." />
          <CardBody className="p-0">
            <table className="w-full text-left text-sm" data-testid="check-statuses">
              <thead className="text-xs text-muted">
                <tr className="border-b border-line">
                  <th className="px-5 py-2 font-medium">Check</th>
                  <th className="px-3 py-2 font-medium">Every</th>
                  <th className="px-3 py-2 font-medium">Last done</th>
                  <th className="px-5 py-2 font-medium">State</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {statuses.map((c) => (
                  <tr key={`${c.check}-${c.machine?.id ?? "unit"}`}>
                    <td className="px-5 py-2">
                      {c.label}
                      {c.machine && <span className="text-muted"> · {c.machine.code}</span>}
                    </td>
                    <td className="px-3 py-2 text-muted">{c.intervalDays === 1 ? "day" : c.intervalDays === 7 ? "week" : `${c.intervalDays} days`}</td>
                    <td className="px-3 py-2 tabular-nums">{c.lastAt ? formatDateTime(c.lastAt, timeZone) : "Never"}</td>
                    <td className="px-5 py-2">
                      <Badge tone={DUE_TONES[c.state.status]}>
                        {DUE_WORDS[c.state.status]}
                        {c.state.status === "overdue" && c.state.dueOn ? ` since ${c.state.dueOn}` : ""}
                      </Badge>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </CardBody>
        </Card>

        {record && (
          <Card>
            <CardHeader title="Record an entry" description={manage ? undefined : "Service visits are recorded by the quality lead."} />
            <CardBody>
              <EntryForm
                kinds={kinds}
                timeZone={timeZone}
                machines={machines.filter((m) => m.active).map((m) => ({ id: m.id, code: m.code, name: m.name, kind: m.kind, outOfUse: m.outOfUse }))}
              />
            </CardBody>
          </Card>
        )}
      </div>

      <Card className="mt-6">
        <CardHeader title="The log" description={`${entries.length} entr${entries.length === 1 ? "y" : "ies"}${filtered ? " matching the filter" : ""}, newest first (at most 300).`} />
        <CardBody className="border-b border-line">
          <form method="get" className="flex flex-wrap items-end gap-3 text-sm" aria-label="Filter the log">
            <label className="space-y-1">
              <span className="block text-xs font-medium text-muted">Machine</span>
              <Select name="machine" defaultValue={filter.machine ? String(filter.machine) : ""}>
                <option value="">All, and rooms</option>
                {machines.map((m) => (
                  <option key={m.id} value={m.id}>
                    {m.code} · {m.name}
                  </option>
                ))}
              </Select>
            </label>
            <label className="space-y-1">
              <span className="block text-xs font-medium text-muted">Kind of entry</span>
              <Select name="kind" defaultValue={filter.kind ?? ""}>
                <option value="">All kinds</option>
                {ENTRY_KINDS.map((k) => (
                  <option key={k} value={k}>
                    {ENTRY_KIND_LABELS[k]}
                  </option>
                ))}
              </Select>
            </label>
            <label className="space-y-1">
              <span className="block text-xs font-medium text-muted">From</span>
              <Input type="date" name="from" defaultValue={filter.from ?? ""} />
            </label>
            <label className="space-y-1">
              <span className="block text-xs font-medium text-muted">To</span>
              <Input type="date" name="to" defaultValue={filter.to ?? ""} />
            </label>
            <label className="flex h-10 items-center gap-2">
              <input type="checkbox" name="flagged" value="1" defaultChecked={filter.flagged === "1"} className="h-4 w-4 accent-lagoon-700" /> Out of range only
            </label>
            <Button type="submit" variant="secondary">
              Filter
            </Button>
            {filtered && (
              <Link href="/unit/monitoring" className="h-10 py-2 text-lagoon-700 underline-offset-2 hover:underline">
                Clear filter
              </Link>
            )}
          </form>
        </CardBody>
        {entries.length === 0 ? (
          <CardBody className="text-sm text-muted">No entries.</CardBody>
        ) : (
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm" data-testid="log-entries">
              <thead className="text-xs text-muted">
                <tr className="border-b border-line">
                  <th className="px-5 py-2 font-medium">Done at</th>
                  <th className="px-3 py-2 font-medium">Entry</th>
                  <th className="px-3 py-2 font-medium">Machine or place</th>
                  <th className="px-3 py-2 font-medium">Reading or result</th>
                  <th className="px-3 py-2 font-medium">By</th>
                  <th className="px-5 py-2 font-medium">Check</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {entries.map((e) => (
                  <tr key={e.id} className={e.outOfRange ? "bg-danger-50/60" : undefined}>
                    <td className="whitespace-nowrap px-5 py-2 align-top tabular-nums">{formatDateTime(e.at, timeZone)}</td>
                    <td className="px-3 py-2 align-top">{e.kindLabel}</td>
                    <td className="px-3 py-2 align-top">
                      {e.machine ? (
                        <Link href={`/unit/machines/${e.machine.id}`} className="text-lagoon-700 underline-offset-2 hover:underline">
                          {e.machine.code}
                        </Link>
                      ) : (
                        (e.place ?? "—")
                      )}
                    </td>
                    <td className="px-3 py-2 align-top">
                      {e.summary}
                      {e.notes && <span className="block text-xs text-muted">{e.notes}</span>}
                      {e.fault && !e.fault.open && (
                        <span className="block text-xs text-muted">
                          Cleared {formatDateTime(e.fault.clearedAt, timeZone)}
                          {e.fault.clearedBy ? ` by ${e.fault.clearedBy}` : ""}: {e.fault.note}
                        </span>
                      )}
                    </td>
                    <td className="px-3 py-2 align-top">{e.recordedBy}</td>
                    <td className="px-5 py-2 align-top">
                      {e.outOfRange ? (
                        <>
                          <Badge tone="danger">Out of range</Badge>
                          {e.findings.map((f) => (
                            <span key={f} className="mt-1 block text-xs text-danger-700">
                              {f}
                            </span>
                          ))}
                        </>
                      ) : e.fault?.open ? (
                        <div className="flex flex-wrap items-center gap-2">
                          <Badge tone="danger">Out of use</Badge>
                          {manage && e.machine && <ClearFaultDialog faultId={e.id} machineCode={e.machine.code} />}
                        </div>
                      ) : e.fault ? (
                        <Badge tone="neutral">Cleared</Badge>
                      ) : e.kind === "store_climate" || e.kind === "water_reading" || e.kind === "seal_test" ? (
                        <Badge tone="ok">Within limits</Badge>
                      ) : (
                        <span className="text-muted">—</span>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        )}
      </Card>

      <Card className="mt-6">
        <CardHeader
          title="Limits and intervals"
          description={manage ? "Each entry is checked against the limits in force when it is recorded." : "Set by the quality lead; each entry is checked against the limits in force when it is recorded."}
        />
        <CardBody>
          {manage ? (
            <SettingsForm settings={settings} />
          ) : (
            <ul className="space-y-1 text-sm">
              {LIMIT_KEYS.map((k) => (
                <li key={k}>
                  <span className="font-medium">{LIMIT_INFO[k].label}:</span> {describeRange(settings.limits[k], LIMIT_INFO[k].unit)}
                </li>
              ))}
            </ul>
          )}
        </CardBody>
      </Card>
    </>
  );
}
