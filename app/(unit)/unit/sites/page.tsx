import type { Metadata } from "next";
import { SitesTable } from "@/components/sites/sites-table";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { weekdayKey } from "@/lib/format";

export const metadata: Metadata = { title: "Sites" };

export default async function UnitSitesPage() {
  const user = await requirePermission("sites.view");
  const organisations = await getDb()
    .selectFrom("organisations")
    .select(["id", "name"])
    .orderBy("kind", "desc")
    .orderBy("name")
    .execute();
  return (
    <>
      <PageHeader title="Sites" description="The unit's depot and every customer site, with today's opening hours. Add sites from the customer's page." />
      <SitesTable organisations={organisations} today={weekdayKey(new Date())} canManage={can(user.role, "sites.manage")} />
    </>
  );
}
