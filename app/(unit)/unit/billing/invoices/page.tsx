import type { Metadata } from "next";
import Link from "next/link";
import { InvoiceTable } from "@/components/billing/invoice-table";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { INVOICE_STATUSES, invoiceCustomers } from "@/lib/billing/invoices";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Invoices" };

// Every customer's invoices by status and age, with totals and the CSV exports.
export default async function UnitInvoicesPage() {
  const user = await requirePermission("billing.view");
  const customers = await invoiceCustomers(getDb(), user);
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/billing" className="text-lagoon-700 hover:underline">
          ← Invoice runs
        </Link>
      </p>
      <PageHeader
        title="Invoices"
        description="Open invoices by how long they are past their due date, and every invoice by status. Choose an age to list those invoices; the exports follow the filters."
        actions={
          can(user.role, "billing.manage") && (
            <Button variant="secondary" asChild>
              <Link href="/unit/billing/settings">Reminders and seller details</Link>
            </Button>
          )
        }
      />
      <InvoiceTable audience="unit" customers={customers} statuses={[...INVOICE_STATUSES]} timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
