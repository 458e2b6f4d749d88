import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { BookingForm } from "@/components/orders/booking-form";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { amendDefaults } from "@/lib/orders/defaults";
import { orderForPage } from "@/lib/orders/pages";

export const metadata: Metadata = { title: "Change booking" };

export default async function EditBookingPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("orders.book");
  const order = await orderForPage(getDb(), user, (await params).id);
  if (order.status !== "booked") notFound();
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  return (
    <>
      <PageHeader title={`Change ${order.reference}`} description="Until the van collects, you can change the sets, the times and the service level." />
      <BookingForm sites={[{ id: order.siteId, name: order.siteName }]} initial={amendDefaults(order, timeZone)} orderId={order.id} timeZone={timeZone} />
    </>
  );
}
