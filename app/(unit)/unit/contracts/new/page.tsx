import { Info } from "lucide-react";
import type { Metadata } from "next";
import type { ReactNode } from "react";
import { ContractForm } from "@/components/contracts/contract-form";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { blankContractValues, contractFormValues } from "@/lib/contracts/form-values";
import { formatLocalDate } from "@/lib/contracts/format";
import { contractForPage } from "@/lib/contracts/pages";
import { listContractCustomers, unitTimeZone } from "@/lib/contracts/service";

export const metadata: Metadata = { title: "New contract version" };

// A first contract for a customer, or with ?from=<id> the next version, copied from that one.
export default async function NewContractPage({ searchParams }: { searchParams: Promise<{ from?: string; customer?: string }> }) {
  const user = await requirePermission("contracts.manage");
  const { from, customer } = await searchParams;
  const db = getDb();

  if (from) {
    const source = await contractForPage(db, user, from);
    return (
      <>
        <PageHeader title={`Next version for ${source.organisationName}`} description={`A copy of ${source.reference}; change what differs.`} />
        <Notice>
          {source.validUntil === null
            ? `${source.reference} is open-ended, so any later version would overlap it. End it first on its page (set its last day), then start this version the day after.`
            : `${source.reference} ends on ${formatLocalDate(source.validUntil)}, so this version starts the day after. Leave “Valid until” empty for an open-ended version.`}
        </Notice>
        <ContractForm
          mode="create"
          defaultValues={contractFormValues(source, { asNextVersion: true })}
          customers={[]}
          lockedCustomerName={source.organisationName}
          cancelHref={`/unit/contracts/${source.id}`}
        />
      </>
    );
  }

  const customers = await listContractCustomers(db, user);
  const chosen = customers.find((c) => String(c.id) === customer);
  return (
    <>
      <PageHeader title="New contract version" description="Terms for one customer over one validity period. Every set class needs a price." />
      <ContractForm mode="create" defaultValues={blankContractValues(unitTimeZone(), chosen?.id)} customers={customers} cancelHref="/unit/contracts" />
    </>
  );
}

function Notice({ children }: { children: ReactNode }) {
  return (
    <p className="mb-6 flex gap-2 rounded-lg border border-lagoon-200 bg-lagoon-50 px-4 py-3 text-sm text-lagoon-800">
      <Info className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
      <span>{children}</span>
    </p>
  );
}
