import type { Metadata } from "next";
import { PreviewPanel } from "@/components/billing/preview-panel";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";
import { addMonths, monthLabel, monthOf } from "@/lib/billing/run-periods";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "New invoice run" };

export default async function NewRunPage({ searchParams }: { searchParams: Promise<{ period?: string }> }) {
  await requirePermission("billing.manage");
  const { period } = await searchParams;
  const thisMonth = monthOf(new Date(), serverEnv().UNIT_TIME_ZONE);
  // This month (so far) and the twelve before it.
  const months = Array.from({ length: 13 }, (_, i) => addMonths(thisMonth, -i)).map((value) => ({ value, label: monthLabel(value) }));
  const initial = months.some((m) => m.value === period) ? period! : addMonths(thisMonth, -1);
  return (
    <>
      <PageHeader
        title="New invoice run"
        description="The preview prices every delivered set of the month that is not on an invoice yet, under the contract version in force when it was delivered. Nothing is saved until you create the run."
      />
      <PreviewPanel months={months} initialMonth={initial} />
    </>
  );
}
