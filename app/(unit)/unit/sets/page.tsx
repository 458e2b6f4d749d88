import type { Metadata } from "next";
import { SetsPage } from "@/components/sets/sets-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Sets" };

export default async function UnitSetsPage() {
  const user = await requirePermission("sets.view");
  return (
    <SetsPage
      user={user}
      title="Sets"
      description="Every customer's physical sets: each one a tray, container or pouch with its own serial and GS1 identifier."
      basePath="/unit/sets"
    />
  );
}
