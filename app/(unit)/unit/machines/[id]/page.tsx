import type { Metadata } from "next";
import { MachinePage } from "@/components/machines/machine-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Machine" };

export default async function UnitMachinePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("machines.view");
  const { id } = await params;
  return <MachinePage user={user} rawId={id} />;
}
