import type { Metadata } from "next";
import Link from "next/link";
import { ReceivingStation } from "@/components/stations/receiving-station";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { getReceivingOrder } from "@/lib/stations/receiving";
import type { ReceivingOrder } from "@/lib/stations/receiving-shared";

export const metadata: Metadata = { title: "Receiving" };

// The receiving station; ?order=<id> reopens the order being received after a reload.
export default async function ReceivingPage({ searchParams }: { searchParams: Promise<{ order?: string | string[] }> }) {
  const user = await requirePermission("stations.operate");
  const { order } = await searchParams;
  let initialOrder: ReceivingOrder | null = null;
  if (typeof order === "string" && /^[1-9]\d{0,15}$/.test(order)) {
    initialOrder = await getReceivingOrder(getDb(), user, Number(order)).catch((error: unknown) => {
      if (error instanceof AppError && error.code === "not_found") return null;
      throw error;
    });
  }
  return (
    <>
      <PageHeader
        title="Receiving"
        description="Scan each set as it comes off the van."
        actions={
          <Link href="/unit/stations" className="text-sm font-medium text-lagoon-700 underline">
            Other stations
          </Link>
        }
      />
      <ReceivingStation timeZone={serverEnv().UNIT_TIME_ZONE} initialOrder={initialOrder} />
    </>
  );
}
