import type { Metadata } from "next";
import Link from "next/link";
import { ExpiringCard } from "@/components/expiry/expiring-card";
import { Stat } from "@/components/home/stat";
import { SiteCards } from "@/components/sites/site-cards";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { listExpiringSets } from "@/lib/expiry/service";
import { weekdayKey } from "@/lib/format";
import { teamSummary } from "@/lib/home/queries";
import { listSites } from "@/lib/sites/queries";
import { RecallBanner } from "@/components/sterilising/recall-banner";
import { listRecalls } from "@/lib/sterilising/recalls";

export const metadata: Metadata = { title: "Overview" };

// The clinic's home: its sites as the unit's van sees them, and (for managers) its team.
export default async function ClinicHome() {
  const user = await requirePermission("home.view");
  const db = getDb();
  const [sites, team, expiring, recalls] = await Promise.all([
    listSites(db, user),
    can(user.role, "users.view") ? teamSummary(db, user) : Promise.resolve(null),
    listExpiringSets(db, user),
    can(user.role, "recalls.view") ? listRecalls(db, user, { openOnly: true }) : Promise.resolve([]),
  ]);
  return (
    <>
      <PageHeader
        title={`Good to see you, ${user.name.split(" ")[0]}`}
        description={`${user.organisationName} — what Larkmoor Sterile Services knows about your ${user.role === "clinic_staff" ? "site" : "sites"}.`}
      />
      <RecallBanner recalls={recalls} />
      {team && (
        <div className="mb-8 grid gap-4 sm:grid-cols-3">
          <Stat label="People with access" value={team.active} />
          <Stat label="Invitations not yet accepted" value={team.invited} />
          <Stat label="Accounts switched off" value={team.disabled} />
          <p className="text-sm sm:col-span-3">
            <Link href="/clinic/team" className="font-medium text-lagoon-700 underline">
              Manage your team
            </Link>
          </p>
        </div>
      )}
      <ExpiringCard list={expiring} />
      <h2 className="mb-3 text-lg font-semibold">{user.role === "clinic_staff" ? "Your site" : "Your sites"}</h2>
      <SiteCards sites={sites} today={weekdayKey(new Date())} />
    </>
  );
}
