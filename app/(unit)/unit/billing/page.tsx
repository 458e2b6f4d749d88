import { FilePlus2 } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { RunList } from "@/components/billing/run-list";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { listRuns } from "@/lib/billing/run";

export const metadata: Metadata = { title: "Billing" };

export default async function BillingPage() {
  const user = await requirePermission("billing.view");
  const runs = await listRuns(getDb(), user);
  return (
    <>
      <PageHeader
        title="Billing"
        description="Invoice runs by month. A run prices every set delivered in the month exactly once under the contract in force, is approved, and is then issued through the payment service."
        actions={
          <>
            <Button variant="secondary" asChild>
              <Link href="/unit/billing/invoices">All invoices</Link>
            </Button>
            <Button variant="secondary" asChild>
              <Link href="/unit/billing/settings">Settings</Link>
            </Button>
            {can(user.role, "billing.manage") && (
              <Button asChild>
                <Link href="/unit/billing/new">
                  <FilePlus2 className="h-4 w-4" aria-hidden="true" />
                  New run
                </Link>
              </Button>
            )}
          </>
        }
      />
      <RunList runs={runs} />
    </>
  );
}
