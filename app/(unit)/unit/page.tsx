import type { Metadata } from "next";
import Link from "next/link";
import { Stat } from "@/components/home/stat";
import { MonitoringWarningsPanel } from "@/components/monitoring/home-warnings";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { formatDate, formatDateTime, weekdayKey } from "@/lib/format";
import { serverEnv } from "@/lib/env";
import { customerSummaries, recentAudit, teamSummary } from "@/lib/home/queries";
import { monitoringWarnings } from "@/lib/monitoring/service";
import { formatDayHours } from "@/lib/sites/opening-hours";
import { listSites } from "@/lib/sites/queries";

export const metadata: Metadata = { title: "Overview" };

const FOCUS: Record<string, string> = {
  admin: "Customers, their sites and everyone's access.",
  dispatcher: "Which customer sites are open today, for planning the vans.",
  technician: "The customers whose sets come through the stations.",
  quality_lead: "The customers the unit answers to, and the latest changes on record.",
  finance: "The customers the unit bills.",
};

// The unit's home: what each unit role looks at first.
export default async function UnitHome() {
  const user = await requirePermission("home.view");
  const db = getDb();
  const now = new Date();
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const [customers, sites, team, audit, warnings] = await Promise.all([
    customerSummaries(db),
    user.role === "dispatcher" ? listSites(db, user) : Promise.resolve([]),
    can(user.role, "users.view") ? teamSummary(db, user) : Promise.resolve(null),
    can(user.role, "audit.view") ? recentAudit(db) : Promise.resolve([]),
    can(user.role, "machine_log.view") ? monitoringWarnings(db, now, timeZone) : Promise.resolve(null),
  ]);
  const today = weekdayKey(now);
  return (
    <>
      <PageHeader title={`${ROLE_LABELS[user.role]} overview`} description={`${formatDate(now)} — ${FOCUS[user.role] ?? ""}`} />
      {warnings && <MonitoringWarningsPanel warnings={warnings} timeZone={timeZone} />}
      {team && (
        <div className="mb-8 grid gap-4 sm:grid-cols-3">
          <Stat label="Customers" value={customers.length} />
          <Stat label="Active accounts" value={team.active} />
          <Stat label="Invitations pending" value={team.invited} />
        </div>
      )}
      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <CardHeader title="Customers" description="Organisations the unit reprocesses for." />
          <CardBody className="p-0">
            <ul className="divide-y divide-line">
              {customers.map((c) => (
                <li key={c.id} className="flex items-center justify-between px-5 py-3 text-sm">
                  <span>
                    <span className="font-medium">{c.name}</span> <span className="text-muted">({c.shortCode})</span>
                  </span>
                  <span className="text-muted">
                    {c.sites} {c.sites === 1 ? "site" : "sites"} · {c.users} {c.users === 1 ? "person" : "people"}
                  </span>
                </li>
              ))}
            </ul>
          </CardBody>
        </Card>
        {user.role === "dispatcher" && (
          <Card>
            <CardHeader title="Open today" description="Customer sites and their hours today." />
            <CardBody className="p-0">
              <ul className="divide-y divide-line">
                {sites
                  .filter((s) => !s.isDepot)
                  .map((s) => (
                    <li key={s.id} className="flex items-center justify-between gap-4 px-5 py-3 text-sm">
                      <span className="font-medium">{s.name}</span>
                      <span className="tabular-nums text-muted">{formatDayHours(s.openingHours[today])}</span>
                    </li>
                  ))}
              </ul>
            </CardBody>
          </Card>
        )}
        {audit.length > 0 && (
          <Card>
            <CardHeader title="Latest changes" description="From the audit log, newest first." />
            <CardBody className="p-0">
              <ul className="divide-y divide-line">
                {audit.map((a) => (
                  <li key={a.id} className="px-5 py-3 text-sm">
                    <span className="font-medium">{a.action.replace(".", " · ").replaceAll("_", " ")}</span>
                    <span className="text-muted">
                      {" "}
                      — {a.actorName ?? "system"}
                      {a.organisationName ? `, ${a.organisationName}` : ""}, {formatDateTime(a.at)}
                    </span>
                  </li>
                ))}
              </ul>
            </CardBody>
          </Card>
        )}
      </div>
      {can(user.role, "users.view") && (
        <p className="mt-6 text-sm">
          <Link href="/unit/users" className="font-medium text-lagoon-700 underline">
            Manage people and invitations
          </Link>
        </p>
      )}
    </>
  );
}
