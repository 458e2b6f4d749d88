import { FileUp } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { CustomerPicker } from "@/components/catalogue/customer-picker";
import { SetTypeFormDialog } from "@/components/catalogue/set-type-form-dialog";
import { SetTypeTable } from "@/components/catalogue/set-type-table";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { listCatalogueCustomers } from "@/lib/catalogue/set-types";

export const metadata: Metadata = { title: "Set catalogue" };

export default async function UnitCataloguePage({ searchParams }: { searchParams: Promise<{ organisation?: string }> }) {
  const user = await requirePermission("catalogue.view");
  const customers = await listCatalogueCustomers(getDb(), user);
  const { organisation } = await searchParams;
  const selected = customers.find((c) => String(c.id) === organisation) ?? customers[0];
  const canManage = can(user.role, "catalogue.manage");
  return (
    <>
      <PageHeader
        title="Set catalogue"
        description="Each customer's set types: contents lists, packaging, sterilisation method, processing steps and instructions for use."
        actions={
          canManage &&
          selected && (
            <>
              <Button asChild variant="secondary">
                <Link href={`/unit/catalogue/import?organisation=${selected.id}`}>
                  <FileUp className="h-4 w-4" aria-hidden="true" />
                  Import CSV
                </Link>
              </Button>
              <SetTypeFormDialog target={{ mode: "create", organisationId: selected.id }} organisationName={selected.name} basePath="/unit/catalogue" />
            </>
          )
        }
      />
      {selected ? (
        <div className="space-y-5">
          <CustomerPicker customers={customers} selectedId={selected.id} />
          <SetTypeTable key={selected.id} organisationId={selected.id} basePath="/unit/catalogue" />
        </div>
      ) : (
        <p className="text-sm text-muted">There are no active customers yet; add one first.</p>
      )}
    </>
  );
}
