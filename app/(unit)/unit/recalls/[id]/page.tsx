import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { RecallDetails } from "@/components/sterilising/recall-view";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { getRecall, type RecallView } from "@/lib/sterilising/recalls";

export const metadata: Metadata = { title: "Recall" };
export const dynamic = "force-dynamic";

// One recall in the caller's scope (another tenant's answers 404).
export default async function RecallPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("recalls.view");
  const { id } = await params;
  if (!/^[1-9][0-9]{0,15}$/.test(id)) notFound();
  let recall: RecallView;
  try {
    recall = await getRecall(getDb(), user, Number(id));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/recalls" className="text-lagoon-700 underline-offset-2 hover:underline">
          ← All recalls
        </Link>
      </p>
      <PageHeader title={`Recall ${recall.number}`} description="Do not use these sets; send them back to the unit." />
      <RecallDetails recall={recall} canManage={can(user.role, "recalls.manage")} showMail={can(user.role, "recalls.manage")} />
    </>
  );
}
