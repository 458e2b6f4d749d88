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
import { startPaymentAction } from "./actions";

export const metadata: Metadata = { title: "Invoice" };

/** The invoice in the caller's scope, or the not-found page (also for another tenant's invoice). */
async function invoiceForPage(db: DB, user: Awaited<ReturnType<typeof requirePermission>>, idText: string): Promise<InvoiceDetail> {
  if (!/^[1-9]\d{0,15}$/.test(idText)) notFound();
  return getInvoiceDetail(db, user, Number(idText)).catch((error: unknown) => {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  });
}

export default async function ClinicInvoicePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("billing.view");
  const invoice = await invoiceForPage(getDb(), user, (await params).id);
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/clinic/invoices" className="text-lagoon-700 hover:underline">
          ← All invoices
        </Link>
      </p>
      <PageHeader title={`Invoice ${invoice.number}`} description={`${invoice.organisationName}. Amounts include VAT where shown.`} />
      <InvoiceDetailView
        initial={invoice}
        audience="clinic"
        timeZone={serverEnv().UNIT_TIME_ZONE}
        payAction={can(user.role, "invoices.pay") ? startPaymentAction : undefined}
      />
    </>
  );
}
