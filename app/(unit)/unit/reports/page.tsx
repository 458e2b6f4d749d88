import { redirect } from "next/navigation";
import { requirePermission } from "@/lib/auth/current-user";

// The reports start at on-time return.
export default async function UnitReportsPage() {
  await requirePermission("reports.unit");
  redirect("/unit/reports/on-time");
}
