import type { Metadata } from "next";
import Link from "next/link";
import { CustomerPicker } from "@/components/catalogue/customer-picker";
import { ImportPanel } from "@/components/catalogue/import-panel";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listCatalogueCustomers } from "@/lib/catalogue/set-types";

export const metadata: Metadata = { title: "Import set types" };

export default async function CatalogueImportPage({ searchParams }: { searchParams: Promise<{ organisation?: string }> }) {
  const user = await requirePermission("catalogue.manage");
  const customers = await listCatalogueCustomers(getDb(), user);
  const { organisation } = await searchParams;
  const selected = customers.find((c) => String(c.id) === organisation) ?? customers[0];
  return (
    <>
      <Link href={selected ? `/unit/catalogue?organisation=${selected.id}` : "/unit/catalogue"} className="text-sm font-medium text-lagoon-700 hover:underline">
        ← Set catalogue
      </Link>
      <div className="mt-3">
        <PageHeader
          title="Import set types"
          description="Check a CSV file first: every problem is listed with its line and column, and nothing is written until you import a file without problems."
        />
      </div>
      {selected ? (
        <div className="space-y-6">
          <CustomerPicker customers={customers} selectedId={selected.id} id="import-customer" />
          <ImportPanel key={selected.id} organisationId={selected.id} organisationName={selected.name} />
        </div>
      ) : (
        <p className="text-sm text-muted">There are no active customers yet; add one first.</p>
      )}
    </>
  );
}
