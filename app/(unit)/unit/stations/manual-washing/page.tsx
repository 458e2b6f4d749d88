import type { Metadata } from "next";
import Link from "next/link";
import { ManualWashingStation } from "@/components/washing/manual-washing-station";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Manual washing" };

// The manual-washing station: sets washed by hand, each step confirmed, recorded as its own event.
export default async function ManualWashingPage() {
  const user = await requirePermission("stations.operate");
  return (
    <>
      <PageHeader
        title="Manual washing"
        description="For sets that must not go in a washer-disinfector, or that the technician washes by hand: scan the set, confirm each step, record the wash."
        actions={
          <Link href="/unit/stations" className="text-sm font-medium text-lagoon-700 underline">
            Other stations
          </Link>
        }
      />
      <ManualWashingStation operator={user.name} />
    </>
  );
}
