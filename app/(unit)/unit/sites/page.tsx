import type { Metadata } from "next";
import { SiteCards } from "@/components/sites/site-cards";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { weekdayKey } from "@/lib/format";
import { listSites } from "@/lib/sites/queries";

export const metadata: Metadata = { title: "Customer sites" };

export default async function UnitSitesPage() {
  const user = await requirePermission("sites.view");
  const sites = await listSites(getDb(), user);
  return (
    <>
      <PageHeader title="Sites" description="The unit's depot and every customer site, with today's opening hours." />
      <SiteCards sites={sites} today={weekdayKey(new Date())} showOrganisation showWeek />
    </>
  );
}
