import type { Metadata } from "next";
import { SetsPage } from "@/components/sets/sets-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Our sets" };

export default async function ClinicSetsPage() {
  const user = await requirePermission("sets.view");
  return (
    <SetsPage
      user={user}
      title="Our sets"
      description="The sets the unit processes for you, each with its serial and the GS1 code on its label. Ask the unit to add or retire sets."
      basePath="/clinic/sets"
    />
  );
}
