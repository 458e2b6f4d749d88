import type { Metadata } from "next";
import { ContractView } from "@/components/contracts/contract-view";
import { VersionsList } from "@/components/contracts/versions-list";
import { Card, CardBody } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { formatLocalDate } from "@/lib/contracts/format";
import { getContract, listOrganisationContracts, primaryContractFor, unitToday } from "@/lib/contracts/service";

export const metadata: Metadata = { title: "Contract" };

// The clinic manager's read-only view of its organisation's contract: the version in force today
// (or the next one, before the first starts) and every other version.
export default async function ClinicContractPage() {
  const user = await requirePermission("contracts.view");
  const db = getDb();
  const primary = await primaryContractFor(db, user, user.organisationId);
  if (!primary) {
    return (
      <>
        <PageHeader title="Contract" />
        <Card>
          <CardBody className="text-sm text-muted">
            There is no contract on file for {user.organisationName} yet. The unit&apos;s finance team will add it here once it is agreed.
          </CardBody>
        </Card>
      </>
    );
  }
  const [contract, versions] = await Promise.all([
    getContract(db, user, primary.id),
    listOrganisationContracts(db, user, user.organisationId),
  ]);
  const next = versions.filter((v) => v.status === "upcoming").at(-1);
  const description =
    contract.status === "current"
      ? `The terms in force today for ${user.organisationName}.` +
        (next ? ` A new version, ${next.reference}, starts on ${formatLocalDate(next.validFrom)}.` : "")
      : contract.status === "upcoming"
        ? `Your first contract starts on ${formatLocalDate(contract.validFrom)}.`
        : `No version is in force today; this is the latest, which ended on ${formatLocalDate(contract.validUntil!)}.`;
  return (
    <>
      <PageHeader title="Contract" description={description} />
      <div className="space-y-6">
        <ContractView contract={contract} today={unitToday()} />
        <VersionsList
          title="All versions"
          description="Earlier and later versions of your contract."
          versions={versions}
          hrefFor={(id) => `/clinic/contract/${id}`}
          currentId={contract.id}
        />
      </div>
    </>
  );
}
