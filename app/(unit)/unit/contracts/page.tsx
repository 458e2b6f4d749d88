import { Plus } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { ContractsTable } from "@/components/contracts/contracts-table";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { listContractCustomers } from "@/lib/contracts/service";

export const metadata: Metadata = { title: "Contracts" };

export default async function UnitContractsPage() {
  const user = await requirePermission("contracts.view");
  const customers = await listContractCustomers(getDb(), user);
  return (
    <>
      <PageHeader
        title="Contracts"
        description="Each customer's terms, one version per validity period. Versions of one customer never share a day; the status follows the unit's date today."
        actions={
          can(user.role, "contracts.manage") && (
            <Button asChild>
              <Link href="/unit/contracts/new">
                <Plus className="h-4 w-4" aria-hidden="true" />
                New contract
              </Link>
            </Button>
          )
        }
      />
      <ContractsTable customers={customers} />
    </>
  );
}
