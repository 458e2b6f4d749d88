import type { Metadata } from "next";
import Link from "next/link";
import { CancelOrderButton } from "@/components/orders/cancel-order-button";
import { AutoRefresh } from "@/components/auto-refresh";
import { OrderDetailView } from "@/components/orders/order-detail-view";
import { OrderStatusBadge } from "@/components/orders/order-status-badge";
import { OrderProblems } from "@/components/problems/order-problems";
import { ReceivingNotices } from "@/components/stations/receiving-notices";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { serverEnv } from "@/lib/env";
import { orderForPage } from "@/lib/orders/pages";
import { listOrderNotices } from "@/lib/stations/receiving";

export const metadata: Metadata = { title: "Order" };

export default async function ClinicOrderPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("orders.view");
  const order = await orderForPage(getDb(), user, (await params).id);
  const changeable = order.status === "booked" && can(user.role, "orders.book");
  return (
    <>
      <PageHeader
        title={`Pickup ${order.reference}`}
        description={`${order.siteName}`}
        actions={
          <>
            <OrderStatusBadge status={order.status} />
            {changeable && (
              <>
                <Button variant="secondary" asChild>
                  <Link href={`/clinic/orders/${order.id}/edit`}>Change booking</Link>
                </Button>
                <CancelOrderButton orderId={order.id} reference={order.reference} />
              </>
            )}
          </>
        }
      />
      <AutoRefresh />
      <ReceivingNotices notices={await listOrderNotices(getDb(), user, order.id)} timeZone={serverEnv().UNIT_TIME_ZONE} />
      <OrderDetailView order={order} timeZone={serverEnv().UNIT_TIME_ZONE} />
      <OrderProblems user={user} order={order} timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
