import type { Metadata } from "next";
import { ProblemsTable } from "@/components/problems/problems-table";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Problems" };

export default async function ClinicProblemsPage() {
  await requirePermission("orders.view");
  return (
    <>
      <PageHeader
        title="Problems we reported"
        description="Missing or damaged instruments, wet or torn packs, wrong sets, and the unit's answers. To report a new one, open the order the set came with."
      />
      <ProblemsTable basePath="/clinic/problems" ordersPath="/clinic/orders" initialStatus="" timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
