import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { DayPicker } from "@/components/dispatch/day-picker";
import { DispatchDay } from "@/components/dispatch/dispatch-day";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { addDays } from "@/lib/dispatch/days";
import { daySchema } from "@/lib/dispatch/schemas";
import { listDrivers } from "@/lib/dispatch/vans";
import { getDispatchDay } from "@/lib/dispatch/view";

export const metadata: Metadata = { title: "Dispatch" };

// One day's van runs: shifts, the planner's proposal, moves and locks, publishing, manifests.
export default async function DispatchDayPage({ params }: { params: Promise<{ day: string }> }) {
  const user = await requirePermission("routes.view");
  const parsed = daySchema.safeParse((await params).day);
  if (!parsed.success) notFound();
  const day = parsed.data;
  const db = getDb();
  const [view, drivers] = await Promise.all([getDispatchDay(db, day), listDrivers(db)]);
  return (
    <>
      <PageHeader title={`Dispatch · ${view.dayLabel}`} description="Plan the day's van runs from the booked pickups and the released sets due back, adjust them, publish, and print each van's manifest." />
      <div className="mb-4">
        <DayPicker day={day} previous={addDays(day, -1)} next={addDays(day, 1)} base="/unit/dispatch" />
      </div>
      <DispatchDay view={view} drivers={drivers} canPlan={can(user.role, "routes.plan")} />
    </>
  );
}
