import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { ReportView, type ReportFilterOptions } from "@/components/reports/report-view";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { cn } from "@/lib/cn";
import { defaultPeriod, REPORT_NAMES, type ReportName, reportFilterChoices } from "@/lib/reports/service";

export const metadata: Metadata = { title: "Reports" };

const TABS: Record<ReportName, { label: string; description: string; money?: boolean }> = {
  "on-time": { label: "On-time return", description: "Sets returned within their contract's turnaround, per customer and service level, with every late set behind the figures." },
  volumes: { label: "Volumes", description: "Sets received per customer and set class, per month." },
  stations: { label: "Stations", description: "Scans per station by hour of day: when each station is busy." },
  machines: { label: "Machines", description: "Runs per machine and day, the share of the day each machine ran, and the failed runs with their reasons." },
  capacity: { label: "Capacity", description: "The coming days' booked intake in sterilisation units against the sterilisers' capacity." },
  revenue: { label: "Revenue", description: "What issued invoices billed per customer and month.", money: true },
  receivables: { label: "Receivables", description: "What customers still owe on open invoices, by how long it is past due.", money: true },
};

const isReportName = (value: string): value is ReportName => (REPORT_NAMES as readonly string[]).includes(value);

// One of the unit's reports, with the tabs to the others.
export default async function UnitReportPage({ params }: { params: Promise<{ name: string }> }) {
  const user = await requirePermission("reports.unit");
  const { name } = await params;
  if (!isReportName(name)) notFound();
  const tab = TABS[name];
  const showsMoney = can(user.role, "billing.view");
  if (tab.money && !showsMoney) notFound();
  const choices = await reportFilterChoices(getDb(), user);
  const period = defaultPeriod();
  const unitWide = name === "machines";
  const options: ReportFilterOptions = {
    customers: unitWide ? undefined : choices.customers,
    sites: unitWide || name === "revenue" || name === "receivables" ? undefined : choices.sites,
    period: name !== "receivables" && name !== "capacity",
    grain: name === "on-time",
    capacity: name === "capacity",
  };
  return (
    <>
      <PageHeader title={`Reports: ${tab.label}`} description={tab.description} />
      <nav aria-label="Reports" className="no-print mb-6 flex flex-wrap gap-1 border-b border-line">
        {REPORT_NAMES.filter((n) => !TABS[n].money || showsMoney).map((n) => (
          <Link
            key={n}
            href={`/unit/reports/${n}`}
            aria-current={n === name ? "page" : undefined}
            className={cn(
              "-mb-px rounded-t-lg border px-3 py-2 text-sm font-medium",
              n === name ? "border-line border-b-surface bg-surface text-ink" : "border-transparent text-muted hover:text-ink",
            )}
          >
            {TABS[n].label}
          </Link>
        ))}
      </nav>
      <ReportView
        name={name}
        endpoint="/api/reports"
        options={options}
        defaultFrom={period.from}
        defaultTo={period.to}
        caution={
          name === "machines"
            ? "These figures summarise recorded runs and the advisory checks Steamlane made of them. They do not decide whether a batch or load may be released: that stays with the unit's qualified staff, its validated procedures and local regulations."
            : undefined
        }
      />
    </>
  );
}
