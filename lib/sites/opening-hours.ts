import { z } from "zod";

// Opening hours per weekday, as local wall-clock intervals: { mon: [{ start, end }], …, sun: [] }.

export const WEEKDAYS = ["mon", "tue", "wed", "thu", "fri", "sat", "sun"] as const;
export type Weekday = (typeof WEEKDAYS)[number];

export const WEEKDAY_LABELS: Record<Weekday, string> = {
  mon: "Monday",
  tue: "Tuesday",
  wed: "Wednesday",
  thu: "Thursday",
  fri: "Friday",
  sat: "Saturday",
  sun: "Sunday",
};

const timeText = z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$|^24:00$/, "Use a time like 08:30.");

export const intervalSchema = z
  .object({ start: timeText, end: timeText })
  .refine((i) => i.start < i.end, { message: "The closing time must be after the opening time." });

export const openingHoursSchema = z
  .object(Object.fromEntries(WEEKDAYS.map((d) => [d, z.array(intervalSchema).max(4)])) as Record<
    Weekday,
    z.ZodArray<typeof intervalSchema>
  >)
  .superRefine((hours, ctx) => {
    for (const day of WEEKDAYS) {
      const sorted = [...hours[day]].sort((a, b) => a.start.localeCompare(b.start));
      for (let i = 1; i < sorted.length; i++) {
        if (sorted[i]!.start < sorted[i - 1]!.end) {
          ctx.addIssue({ code: "custom", path: [day], message: `${WEEKDAY_LABELS[day]} has overlapping hours.` });
        }
      }
    }
  });

export type OpeningHours = z.infer<typeof openingHoursSchema>;

export function parseOpeningHours(json: string): OpeningHours {
  return openingHoursSchema.parse(JSON.parse(json));
}

/** "08:00–12:30, 13:30–17:00" or "closed". */
export function formatDayHours(intervals: { start: string; end: string }[]): string {
  if (intervals.length === 0) return "closed";
  return intervals.map((i) => `${i.start}–${i.end}`).join(", ");
}

/** Same hours on the given days, closed on the rest. */
export function weeklyHours(days: readonly Weekday[], start: string, end: string): OpeningHours {
  return Object.fromEntries(WEEKDAYS.map((d) => [d, days.includes(d) ? [{ start, end }] : []])) as OpeningHours;
}
