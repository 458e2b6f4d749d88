import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { InvoiceDetailView } from "@/components/billing/invoice-detail";
import { PageHeader } from "@/components/ui/page-header";
import { type DB, getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { getInvoiceDetail, type InvoiceDetail } from "@/lib/billing/invoices";
import { AppError } from "@/lib/errors";
import { serverEnv } from "@/lib/env";
import { CloseInvoiceDialog } from "./close-invoice-dialog";
import { CreditNoteDialog } from "./credit-note-dialog";

export const metadata: Metadata = { title: "Invoice" };

/** The invoice in the caller's scope, or the not-found page (also for another tenant's invoice). */
async function invoiceForPage(db: DB, user: Awaited<ReturnType<typeof requirePermission>>, idText: string): Promise<InvoiceDetail> {
  if (!/^[1-9]\d{0,15}$/.test(idText)) notFound();
  return getInvoiceDetail(db, user, Number(idText)).catch((error: unknown) => {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  });
}

// One invoice for finance: lines and evidence, payments, credit notes, reminders, and its actions.
export default async function UnitInvoicePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("billing.view");
  const invoice = await invoiceForPage(getDb(), user, (await params).id);
  const manage = can(user.role, "billing.manage");
  const creditable = invoice.status === "open" || invoice.status === "paid" || invoice.status === "uncollectible";
  const actions =
    manage && (creditable || invoice.status === "open") ? (
      <div className="flex flex-wrap gap-2 md:justify-end">
        {creditable && (
          <CreditNoteDialog
            invoiceId={invoice.id}
            currency={invoice.currency}
            paid={invoice.status === "paid"}
            lines={invoice.lines
              .filter((l) => l.quantity > 0 && l.unitPriceMinor > 0)
              .map((l) => ({ id: l.id, description: l.description, quantity: l.quantity, unitPriceMinor: l.unitPriceMinor }))}
          />
        )}
        {invoice.status === "open" && <CloseInvoiceDialog invoiceId={invoice.id} to="uncollectible" />}
        {(invoice.status === "open" || invoice.status === "uncollectible") && <CloseInvoiceDialog invoiceId={invoice.id} to="void" />}
      </div>
    ) : undefined;
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/billing/invoices" className="text-lagoon-700 hover:underline">
          ← All invoices
        </Link>
      </p>
      <PageHeader
        title={`Invoice ${invoice.number}`}
        description={`${invoice.organisationName}${invoice.stripeNumber ? ` · payment service number ${invoice.stripeNumber}` : " · no copy in the payment service yet"}`}
      />
      <InvoiceDetailView initial={invoice} audience="unit" timeZone={serverEnv().UNIT_TIME_ZONE} actions={actions} />
    </>
  );
}
