import type { Metadata } from "next";
import { RecallPage } from "@/components/recalls/recall-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Recall" };
export const dynamic = "force-dynamic";

// One recall in the caller's scope (another tenant's answers 404).
export default async function ClinicRecallPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("recalls.view");
  const { id } = await params;
  return <RecallPage user={user} rawId={id} listHref="/clinic/recalls" />;
}
