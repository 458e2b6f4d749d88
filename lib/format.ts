import { format } from "date-fns";
import { tz } from "@date-fns/tz";

// Dates as people in the unit's time zone read them.

export const UNIT_TIME_ZONE = process.env.UNIT_TIME_ZONE ?? "Europe/London";

export function formatDateTime(iso: string | Date | null | undefined, timeZone = UNIT_TIME_ZONE): string {
  if (!iso) return "—";
  return format(typeof iso === "string" ? new Date(iso) : iso, "d MMM yyyy, HH:mm", { in: tz(timeZone) });
}

export function formatDate(iso: string | Date, timeZone = UNIT_TIME_ZONE): string {
  return format(typeof iso === "string" ? new Date(iso) : iso, "EEEE d MMMM yyyy", { in: tz(timeZone) });
}

/** "mon".."sun" of an instant in the given zone. */
export function weekdayKey(at: Date, timeZone = UNIT_TIME_ZONE): "mon" | "tue" | "wed" | "thu" | "fri" | "sat" | "sun" {
  return format(at, "EEE", { in: tz(timeZone) }).toLowerCase() as "mon";
}
