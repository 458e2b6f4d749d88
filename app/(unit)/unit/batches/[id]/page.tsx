import type { Metadata } from "next";
import { BatchPage } from "@/components/washing/batch-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Washer batch" };

export default async function WasherBatchPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("machines.view");
  const { id } = await params;
  return <BatchPage user={user} rawId={id} />;
}
