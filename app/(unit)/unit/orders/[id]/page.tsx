import type { Metadata } from "next";
import { AutoRefresh } from "@/components/auto-refresh";
import { OrderDetailView } from "@/components/orders/order-detail-view";
import { OrderStatusBadge } from "@/components/orders/order-status-badge";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { orderForPage } from "@/lib/orders/pages";

export const metadata: Metadata = { title: "Order" };

export default async function UnitOrderPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("orders.view");
  const order = await orderForPage(getDb(), user, (await params).id);
  return (
    <>
      <PageHeader title={`${order.reference}`} description={`${order.organisationName} · ${order.siteName}`} actions={<OrderStatusBadge status={order.status} />} />
      <AutoRefresh />
      <OrderDetailView order={order} timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
