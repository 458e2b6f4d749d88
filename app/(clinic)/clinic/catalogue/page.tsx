import type { Metadata } from "next";
import { SetTypeTable } from "@/components/catalogue/set-type-table";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Set catalogue" };

export default async function ClinicCataloguePage() {
  const user = await requirePermission("catalogue.view");
  return (
    <>
      <PageHeader
        title="Set catalogue"
        description={`The set types the unit processes for ${user.organisationName}, with their contents lists. Ask the unit to change them.`}
      />
      <SetTypeTable basePath="/clinic/catalogue" />
    </>
  );
}
