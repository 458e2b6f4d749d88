import type { Metadata } from "next";
import { Plus } from "lucide-react";
import { CustomersTable } from "@/components/customers/customers-table";
import { OrganisationDialog } from "@/components/customers/organisation-dialog";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";

export const metadata: Metadata = { title: "Customers" };

export default async function CustomersPage() {
  const user = await requirePermission("organisations.view");
  return (
    <>
      <PageHeader
        title="Customers"
        description="The hospitals and clinics the unit reprocesses for, and the unit itself."
        actions={
          can(user.role, "organisations.manage") && (
            <OrganisationDialog
              trigger={
                <Button>
                  <Plus className="h-4 w-4" aria-hidden="true" /> New customer
                </Button>
              }
            />
          )
        }
      />
      <CustomersTable />
    </>
  );
}
