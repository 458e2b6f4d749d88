import type { Metadata } from "next";
import Link from "next/link";
import { ReportView } from "@/components/reports/report-view";
import { Card, CardBody } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { cn } from "@/lib/cn";
import { listExpiringSets } from "@/lib/expiry/service";
import { defaultPeriod, reportFilterChoices } from "@/lib/reports/service";

export const metadata: Metadata = { title: "Reports" };

const VIEWS = {
  "on-time": { label: "On-time return", description: "Your sets returned within your contract's turnaround, with every late set listed." },
  volumes: { label: "Volumes", description: "Your sets received by the unit per set class and month." },
  revenue: { label: "Spend", description: "What the unit's issued invoices billed you per month." },
} as const;
type View = keyof typeof VIEWS;

// The customer's own figures: on-time return against its contract, volumes, spend, and the sets
// nearing expiry (which the expiry list handles).
export default async function ClinicReportsPage({ searchParams }: { searchParams: Promise<{ view?: string }> }) {
  const user = await requirePermission("reports.customer");
  const { view: asked } = await searchParams;
  const seesSpend = can(user.role, "billing.view");
  const views = (Object.keys(VIEWS) as View[]).filter((v) => v !== "revenue" || seesSpend);
  const view: View = views.includes(asked as View) ? (asked as View) : "on-time";
  const db = getDb();
  const [choices, expiring] = await Promise.all([reportFilterChoices(db, user), listExpiringSets(db, user)]);
  const period = defaultPeriod();
  const expired = expiring.rows.filter((r) => r.status === "expired").length;
  return (
    <>
      <PageHeader title="Reports" description={VIEWS[view].description} />
      <Card className="no-print mb-6">
        <CardBody className="flex flex-wrap items-center justify-between gap-3 text-sm">
          <p>
            <strong>{expiring.rows.length}</strong> of your delivered sets expire within {expiring.days} days or have expired
            {expired > 0 ? ` (${expired} already expired)` : ""}.
          </p>
          <Link href="/clinic/expiring" className="font-medium text-lagoon-700 hover:underline">
            See the sets nearing expiry →
          </Link>
        </CardBody>
      </Card>
      <nav aria-label="Reports" className="no-print mb-6 flex flex-wrap gap-1 border-b border-line">
        {views.map((v) => (
          <Link
            key={v}
            href={`/clinic/reports?view=${v}`}
            aria-current={v === view ? "page" : undefined}
            className={cn(
              "-mb-px rounded-t-lg border px-3 py-2 text-sm font-medium",
              v === view ? "border-line border-b-surface bg-surface text-ink" : "border-transparent text-muted hover:text-ink",
            )}
          >
            {VIEWS[v].label}
          </Link>
        ))}
      </nav>
      <ReportView
        key={view}
        name={view}
        endpoint="/api/reports/clinic"
        options={{ sites: view === "revenue" || user.role === "clinic_staff" ? undefined : choices.sites, grain: view === "on-time" }}
        defaultFrom={period.from}
        defaultTo={period.to}
      />
    </>
  );
}
