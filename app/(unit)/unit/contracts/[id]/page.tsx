import { CopyPlus, Pencil } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { ContractHistory } from "@/components/contracts/contract-history";
import { ContractView } from "@/components/contracts/contract-view";
import { EndVersionDialog } from "@/components/contracts/end-version-dialog";
import { VersionsList } from "@/components/contracts/versions-list";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { lastDayOfMonth } from "@/lib/contracts/dates";
import { contractForPage } from "@/lib/contracts/pages";
import { contractHistory, listOrganisationContracts, unitToday } from "@/lib/contracts/service";

export const metadata: Metadata = { title: "Contract version" };

export default async function ContractPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("contracts.view");
  const { id } = await params;
  const db = getDb();
  const contract = await contractForPage(db, user, id);
  const [versions, history] = await Promise.all([
    listOrganisationContracts(db, user, contract.organisationId),
    contractHistory(db, user, contract.id),
  ]);
  const monthEnd = lastDayOfMonth(unitToday());
  const manage = can(user.role, "contracts.manage");
  return (
    <>
      <PageHeader
        title={`${contract.organisationName}: ${contract.reference}`}
        description="One version of the customer's contract. Its customer sees the same terms under Contract."
        actions={
          manage && (
            <>
              <Button variant="secondary" asChild>
                <Link href={`/unit/contracts/${contract.id}/edit`}>
                  <Pencil className="h-4 w-4" aria-hidden="true" />
                  Correct
                </Link>
              </Button>
              <EndVersionDialog
                contractId={contract.id}
                reference={contract.reference}
                validFrom={contract.validFrom}
                validUntil={contract.validUntil}
                suggestedLastDay={monthEnd < contract.validFrom ? contract.validFrom : monthEnd}
              />
              <Button asChild>
                <Link href={`/unit/contracts/new?from=${contract.id}`}>
                  <CopyPlus className="h-4 w-4" aria-hidden="true" />
                  New version from this one
                </Link>
              </Button>
            </>
          )
        }
      />
      <div className="space-y-6">
        <ContractView contract={contract} showCustomer today={unitToday()} />
        <div className="grid gap-6 lg:grid-cols-2">
          <VersionsList
            title="Versions of this customer"
            versions={versions}
            hrefFor={(versionId) => `/unit/contracts/${versionId}`}
            currentId={contract.id}
          />
          <ContractHistory entries={history} currency={contract.currency} />
        </div>
      </div>
    </>
  );
}
