import type { Metadata } from "next";
import { MonitoringPage } from "@/components/monitoring/monitoring-page";
import { requirePermission } from "@/lib/auth/current-user";
import { logFilterSchema } from "@/lib/monitoring/schemas";

export const metadata: Metadata = { title: "Monitoring log" };

// The monitoring and maintenance log of the unit's machines and rooms.
export default async function UnitMonitoringPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requirePermission("machine_log.view");
  const raw = await searchParams;
  const first = (v: string | string[] | undefined) => (Array.isArray(v) ? v[0] : v) || undefined;
  const filter = logFilterSchema.parse({ machine: first(raw.machine), kind: first(raw.kind), from: first(raw.from), to: first(raw.to), flagged: first(raw.flagged) });
  return <MonitoringPage user={user} filter={filter} />;
}
