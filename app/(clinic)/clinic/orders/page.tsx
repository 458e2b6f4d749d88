import type { Metadata } from "next";
import { Plus } from "lucide-react";
import Link from "next/link";
import { OrdersTable } from "@/components/orders/orders-table";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { serverEnv } from "@/lib/env";
import { listSites } from "@/lib/sites/queries";

export const metadata: Metadata = { title: "Pickups and returns" };

export default async function ClinicOrdersPage() {
  const user = await requirePermission("orders.view");
  const sites = (await listSites(getDb(), user)).map((s) => ({ id: s.id, name: s.name }));
  return (
    <>
      <PageHeader
        title="Pickups and returns"
        description="Every pickup your sites booked, and where its sets are now. The list refreshes by itself."
        actions={
          can(user.role, "orders.book") && (
            <Button asChild>
              <Link href="/clinic/orders/new">
                <Plus className="h-4 w-4" aria-hidden="true" /> Book a pickup
              </Link>
            </Button>
          )
        }
      />
      <OrdersTable sites={sites} basePath="/clinic/orders" timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
