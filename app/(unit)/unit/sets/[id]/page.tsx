import type { Metadata } from "next";
import { SetPage } from "@/components/sets/set-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Set" };

export default async function UnitSetPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("sets.view");
  const { id } = await params;
  return <SetPage user={user} rawId={id} basePath="/unit/sets" />;
}
