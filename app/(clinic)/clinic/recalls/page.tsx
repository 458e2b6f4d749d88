import type { Metadata } from "next";
import { RecallList } from "@/components/sterilising/recall-list";
import { ReleaseAdvisory } from "@/components/sterilising/release-advisory";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listRecalls } from "@/lib/sterilising/recalls";

export const metadata: Metadata = { title: "Recalls" };
export const dynamic = "force-dynamic";

// Recalls of failed released loads, in the caller's scope.
export default async function RecallsPage() {
  const user = await requirePermission("recalls.view");
  const recalls = await listRecalls(getDb(), user);
  return (
    <>
      <PageHeader title="Recalls" description="Loads that failed after release, and the sets they recall." />
      <ReleaseAdvisory kind="recall" className="mb-6" />
      <RecallList recalls={recalls} base="/clinic/recalls" />
    </>
  );
}
