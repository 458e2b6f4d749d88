import type { Metadata } from "next";
import Link from "next/link";
import { AnswerForm } from "@/components/problems/answer-form";
import { ProblemDetailView } from "@/components/problems/problem-detail-view";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { problemForPage } from "@/lib/problems/pages";

export const metadata: Metadata = { title: "Problem" };

export default async function UnitProblemPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("problems.answer");
  const problem = await problemForPage(getDb(), user, (await params).id);
  return (
    <>
      <PageHeader
        title={`Problem ${problem.id}: ${problem.kindLabel.toLowerCase()}`}
        description={`${problem.organisationName} · ${problem.siteName}${problem.order ? ` · ${problem.order.reference}` : ""}`}
        actions={
          <Button variant="secondary" asChild>
            <Link href="/unit/problems">Back to the queue</Link>
          </Button>
        }
      />
      <ProblemDetailView
        problem={problem}
        audience="unit"
        timeZone={serverEnv().UNIT_TIME_ZONE}
        answerForm={problem.status === "open" ? <AnswerForm problemId={problem.id} siteName={problem.siteName} /> : undefined}
      />
    </>
  );
}
