import type { Metadata } from "next";
import { SiteCards } from "@/components/sites/site-cards";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { weekdayKey } from "@/lib/format";
import { listSites } from "@/lib/sites/queries";

export const metadata: Metadata = { title: "Our sites" };

export default async function ClinicSitesPage() {
  const user = await requirePermission("sites.view");
  const sites = await listSites(getDb(), user);
  return (
    <>
      <PageHeader
        title="Our sites"
        description="Addresses, opening hours and delivery notes the unit's drivers work from. Ask the unit to change them."
      />
      <SiteCards sites={sites} today={weekdayKey(new Date())} showWeek />
    </>
  );
}
