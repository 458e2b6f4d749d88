import type { Metadata } from "next";
import { StationLinks } from "@/components/stations/station-links";
import { WashingStation } from "@/components/washing/washing-station";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listWashersForStation } from "@/lib/washing/service";

export const metadata: Metadata = { title: "Washing" };

// The washing station: load a washer-disinfector batch, start it, close it with its record.
export default async function WashingPage() {
  await requirePermission("stations.operate");
  const washers = await listWashersForStation(getDb());
  return (
    <>
      <PageHeader
        title="Washing"
        description="Choose the washer, scan every set into its batch, start it, and close it with the washer's time and temperature record."
        actions={<StationLinks links={[{ href: "/unit/batches", label: "Washer batches" }]} />}
      />
      <WashingStation initialWashers={washers} />
    </>
  );
}
