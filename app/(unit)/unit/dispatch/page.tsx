import { redirect } from "next/navigation";
import { requirePermission } from "@/lib/auth/current-user";
import { dayText } from "@/lib/dispatch/days";
import { serverEnv } from "@/lib/env";

// The dispatcher's screen opens on today, in the unit's time zone.
export default async function DispatchTodayPage() {
  await requirePermission("routes.view");
  redirect(`/unit/dispatch/${dayText(new Date(), serverEnv().UNIT_TIME_ZONE)}`);
}
