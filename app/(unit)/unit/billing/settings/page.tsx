import type { Metadata } from "next";
import Link from "next/link";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { sellerDetails } from "@/lib/billing/exports-document";
import { REMINDER_TIME, reminderSchedule } from "@/lib/billing/reminders";
import { ReminderScheduleForm } from "./reminder-schedule-form";
import { SellerDetailsFormView } from "./seller-details-form";

export const metadata: Metadata = { title: "Billing settings" };

// Finance's billing settings: when overdue invoices are reminded, and the unit's e-invoice details.
export default async function BillingSettingsPage() {
  const user = await requirePermission("billing.view");
  const editable = can(user.role, "billing.manage");
  const db = getDb();
  const [days, seller] = await Promise.all([reminderSchedule(db), sellerDetails(db)]);
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href="/unit/billing/invoices" className="text-lagoon-700 hover:underline">
          ← Invoices
        </Link>
      </p>
      <PageHeader title="Billing settings" description={editable ? "Changes apply from now on and are kept in the audit log." : "Only finance can change these settings."} />
      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <CardHeader
            title="Payment reminders"
            description={`Every morning at ${REMINDER_TIME}, each open invoice past its due date gets the reminder of the latest day it has reached, once, sent to the customer's clinic managers.`}
          />
          <CardBody>
            <ReminderScheduleForm initial={days} editable={editable} />
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Seller details on e-invoices" description={`${seller.name}${seller.address ? `, ${seller.address}` : ""}. Name and address come from the unit's depot site.`} />
          <CardBody>
            <SellerDetailsFormView initial={{ vatId: seller.vatId, billingEmail: seller.billingEmail }} editable={editable} />
          </CardBody>
        </Card>
      </div>
    </>
  );
}
