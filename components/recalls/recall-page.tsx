import Link from "next/link";
import { notFound } from "next/navigation";
import { RecallDetails } from "@/components/sterilising/recall-view";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { getRecall, type RecallView } from "@/lib/sterilising/recalls";

async function loadOr404(user: SessionUser, rawId: string): Promise<RecallView> {
  if (!/^[1-9][0-9]{0,15}$/.test(rawId)) notFound();
  try {
    return await getRecall(getDb(), user, Number(rawId));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

/** One recall in the caller's scope (another tenant's answers 404), with a link back to `listHref`. */
export async function RecallPage({ user, rawId, listHref }: { user: SessionUser; rawId: string; listHref: string }) {
  const recall = await loadOr404(user, rawId);
  const canManage = can(user.role, "recalls.manage");
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href={listHref} className="text-lagoon-700 underline-offset-2 hover:underline">
          ← All recalls
        </Link>
      </p>
      <PageHeader title={`Recall ${recall.number}`} description="Do not use these sets; send them back to the unit." />
      <RecallDetails recall={recall} canManage={canManage} showMail={canManage} />
    </>
  );
}
