import { ArrowLeft } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { ContractView } from "@/components/contracts/contract-view";
import { VersionsList } from "@/components/contracts/versions-list";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { formatValidity } from "@/lib/contracts/format";
import { contractForPage } from "@/lib/contracts/pages";
import { listOrganisationContracts, unitToday } from "@/lib/contracts/service";

export const metadata: Metadata = { title: "Contract version" };

// One version of the clinic's own contract; another organisation's id shows the not-found page.
export default async function ClinicContractVersionPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("contracts.view");
  const { id } = await params;
  const db = getDb();
  const contract = await contractForPage(db, user, id);
  const versions = await listOrganisationContracts(db, user, contract.organisationId);
  return (
    <>
      <Link href="/clinic/contract" className="mb-3 inline-flex items-center gap-1 text-sm font-medium text-lagoon-700 hover:underline">
        <ArrowLeft className="h-4 w-4" aria-hidden="true" />
        Contract in force
      </Link>
      <PageHeader title={`Contract ${contract.reference}`} description={`Valid ${formatValidity(contract.validFrom, contract.validUntil)}.`} />
      <div className="space-y-6">
        <ContractView contract={contract} today={unitToday()} />
        <VersionsList title="All versions" versions={versions} hrefFor={(versionId) => `/clinic/contract/${versionId}`} currentId={contract.id} />
      </div>
    </>
  );
}
