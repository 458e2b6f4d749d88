import type { Metadata } from "next";
import { RecentUses } from "@/components/procedures/recent-uses";
import { RecordUse } from "@/components/procedures/record-use";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Record use" };

// Scan-first, for a phone in the theatre store: record a sterile set taken for a procedure.
export default async function RecordUsePage() {
  const user = await requirePermission("procedures.record");
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  return (
    <div className="mx-auto max-w-xl">
      <PageHeader
        title="Record a set used"
        description="Scan each sterile set as you take it from the store for a procedure, and record it against your theatre or room and case number — never a patient's name."
      />
      <div className="space-y-6">
        <RecordUse timeZone={timeZone} />
        <RecentUses timeZone={timeZone} showSite={user.role !== "clinic_staff"} />
      </div>
    </div>
  );
}
