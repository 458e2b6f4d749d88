import type { Metadata } from "next";
import Link from "next/link";
import { PackingStation } from "@/components/packing/packing-station";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Packing" };

// The packing station: count a washed set's contents, choose its packaging, pack it or hold it, print its label.
export default async function PackingPage() {
  await requirePermission("stations.operate");
  return (
    <>
      <PageHeader
        title="Packing"
        description="Scan a washed set, count every line of its contents, choose the packaging and pack it."
        actions={
          <Link href="/unit/stations" className="text-sm font-medium text-lagoon-700 underline">
            Other stations
          </Link>
        }
      />
      <PackingStation timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
