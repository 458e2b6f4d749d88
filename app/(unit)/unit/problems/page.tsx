import type { Metadata } from "next";
import { ProblemsTable } from "@/components/problems/problems-table";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { customerOptions } from "@/lib/organisations/service";
import { countOpenProblems } from "@/lib/problems/service";

export const metadata: Metadata = { title: "Problems queue" };

export default async function UnitProblemsPage() {
  const user = await requirePermission("problems.answer");
  const db = getDb();
  const [organisations, open] = await Promise.all([customerOptions(db, user), countOpenProblems(db, user)]);
  return (
    <>
      <PageHeader
        title="Problems queue"
        description={`What customers found wrong with delivered sets. ${open === 0 ? "Nothing waits for an answer." : `${open} ${open === 1 ? "waits" : "wait"} for an answer, the oldest first.`}`}
      />
      <ProblemsTable basePath="/unit/problems" ordersPath="/unit/orders" organisations={organisations} initialStatus="open" timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
