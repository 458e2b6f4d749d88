import type { Metadata } from "next";
import { ProblemDetailView } from "@/components/problems/problem-detail-view";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { problemForPage } from "@/lib/problems/pages";

export const metadata: Metadata = { title: "Problem" };

export default async function ClinicProblemPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("orders.view");
  const problem = await problemForPage(getDb(), user, (await params).id);
  return (
    <>
      <PageHeader title={`Problem ${problem.id}: ${problem.kindLabel.toLowerCase()}`} description={`${problem.siteName}${problem.order ? ` · ${problem.order.reference}` : ""}`} />
      <ProblemDetailView problem={problem} audience="clinic" timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
