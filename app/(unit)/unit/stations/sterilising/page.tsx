import type { Metadata } from "next";
import { StationLinks } from "@/components/stations/station-links";
import { SterilisingStation } from "@/components/sterilising/sterilising-station";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listSterilisersForStation } from "@/lib/sterilising/loads";

export const metadata: Metadata = { title: "Sterilising" };

// The sterilising station: load a steriliser, start it after the day's air-removal test, finish it with its record.
export default async function SterilisingPage() {
  await requirePermission("loads.operate");
  const sterilisers = await listSterilisersForStation(getDb());
  return (
    <>
      <PageHeader
        title="Sterilising"
        description="Choose the steriliser, scan every packed set into its load, start it, and finish it with the steriliser's record and the indicator results."
        actions={
          <StationLinks
            links={[
              { href: "/unit/steriliser-tests", label: "Daily tests" },
              { href: "/unit/loads", label: "Steriliser loads" },
            ]}
          />
        }
      />
      <SterilisingStation initialSterilisers={sterilisers} />
    </>
  );
}
