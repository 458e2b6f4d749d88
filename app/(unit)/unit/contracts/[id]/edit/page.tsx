import { Info } from "lucide-react";
import type { Metadata } from "next";
import { ContractForm } from "@/components/contracts/contract-form";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { contractFormValues } from "@/lib/contracts/form-values";
import { formatLocalDate } from "@/lib/contracts/format";
import { contractForPage } from "@/lib/contracts/pages";

export const metadata: Metadata = { title: "Correct contract version" };

export default async function EditContractPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("contracts.manage");
  const { id } = await params;
  const contract = await contractForPage(getDb(), user, id);
  return (
    <>
      <PageHeader title={`Correct ${contract.reference}`} description={contract.organisationName} />
      {contract.status !== "upcoming" && (
        <p className="mb-6 flex gap-2 rounded-lg border border-warn-600/30 bg-warn-50 px-4 py-3 text-sm text-warn-700">
          <Info className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
          <span>
            This version has applied since {formatLocalDate(contract.validFrom)}. A correction changes it for its whole period and is
            recorded with the values before and after; invoices already issued keep their amounts. For terms that change from a later
            date, end this version and write the next one instead.
          </span>
        </p>
      )}
      <ContractForm
        mode="edit"
        contractId={contract.id}
        defaultValues={contractFormValues(contract)}
        customers={[]}
        lockedCustomerName={contract.organisationName}
        cancelHref={`/unit/contracts/${contract.id}`}
      />
    </>
  );
}
