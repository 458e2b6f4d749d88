import type { Metadata } from "next";
import { OrdersTable } from "@/components/orders/orders-table";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { customerOptions } from "@/lib/organisations/service";

export const metadata: Metadata = { title: "Orders" };

export default async function UnitOrdersPage() {
  const user = await requirePermission("orders.view");
  const organisations = await customerOptions(getDb(), user);
  return (
    <>
      <PageHeader title="Orders" description="Every customer's pickups and returns, newest first." />
      <OrdersTable sites={[]} organisations={organisations} basePath="/unit/orders" timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
