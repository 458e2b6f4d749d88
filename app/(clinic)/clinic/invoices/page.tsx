import type { Metadata } from "next";
import { InvoiceTable } from "@/components/billing/invoice-table";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Invoices" };

// The organisation's invoices: status, due date, what is still due, and which are overdue.
export default async function ClinicInvoicesPage() {
  await requirePermission("billing.view");
  return (
    <>
      <PageHeader
        title="Invoices"
        description="Your organisation's invoices from Larkmoor Sterile Services. Open one to see what it bills, download it, or pay it online."
      />
      <InvoiceTable audience="clinic" statuses={["open", "paid", "uncollectible", "void"]} timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
