import type { Metadata } from "next";
import { ExpiringList } from "@/components/expiry/expiring-list";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { serverEnv } from "@/lib/env";
import { listExpiringSets } from "@/lib/expiry/service";

export const metadata: Metadata = { title: "Sets nearing expiry" };

// Delivered sets whose sterile pack is about to expire or has expired, with one-click send-back.
export default async function ExpiringPage() {
  const user = await requirePermission("sets.view");
  const list = await listExpiringSets(getDb(), user);
  return (
    <>
      <PageHeader
        title="Sets nearing expiry"
        description="Sets delivered to you and not yet used, whose pack expires soon or has expired. Send them back for reprocessing in time. The dates come from the unit's labels; the date on the pack and your local procedures decide whether a set may be used."
      />
      {!can(user.role, "orders.book") && <p className="mb-4 text-sm text-muted">Your role cannot book pickups; ask a colleague to send these back.</p>}
      <ExpiringList initial={list} timeZone={serverEnv().UNIT_TIME_ZONE} showSite={user.role !== "clinic_staff"} />
    </>
  );
}
