import type { Metadata } from "next";
import { BookingForm } from "@/components/orders/booking-form";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { newBookingDefaults } from "@/lib/orders/defaults";
import { listSites } from "@/lib/sites/queries";

export const metadata: Metadata = { title: "Book a pickup" };

export default async function NewBookingPage() {
  const user = await requirePermission("orders.book");
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const sites = (await listSites(getDb(), user)).filter((s) => s.active).map((s) => ({ id: s.id, name: s.name }));
  const first = user.siteId ?? sites[0]?.id ?? 0;
  return (
    <>
      <PageHeader
        title="Book a pickup"
        description="Choose the sets to collect, when the van may come, and when you need them back. The promised return time follows your contract's turnaround."
      />
      <BookingForm sites={sites} initial={newBookingDefaults(first, new Date(), timeZone)} timeZone={timeZone} />
    </>
  );
}
