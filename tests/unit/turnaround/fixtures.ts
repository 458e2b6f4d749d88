import type { ServiceCalendar, WorkingInterval } from "@/lib/turnaround";

// Calendars shared by the turnaround tests (invented for the tests, Europe/London like the demo).

const day = (start: string, end: string): WorkingInterval[] => [{ start, end }];

export const weekdaysAllDay = (holidays: string[] = []): ServiceCalendar => ({
  timeZone: "Europe/London",
  hours: {
    mon: day("00:00", "24:00"),
    tue: day("00:00", "24:00"),
    wed: day("00:00", "24:00"),
    thu: day("00:00", "24:00"),
    fri: day("00:00", "24:00"),
    sat: [],
    sun: [],
  },
  holidays,
});

export const weekdaysEightToSix = (holidays: string[] = []): ServiceCalendar => ({
  timeZone: "Europe/London",
  hours: {
    mon: day("08:00", "18:00"),
    tue: day("08:00", "18:00"),
    wed: day("08:00", "18:00"),
    thu: day("08:00", "18:00"),
    fri: day("08:00", "18:00"),
    sat: [],
    sun: [],
  },
  holidays,
});

export const allWeek = (timeZone = "Europe/London"): ServiceCalendar => ({
  timeZone,
  hours: {
    mon: day("00:00", "24:00"),
    tue: day("00:00", "24:00"),
    wed: day("00:00", "24:00"),
    thu: day("00:00", "24:00"),
    fri: day("00:00", "24:00"),
    sat: day("00:00", "24:00"),
    sun: day("00:00", "24:00"),
  },
  holidays: [],
});

// Weekdays 08:00–18:00 and a Sunday night shift whose hours cross the 01:00 UTC clock change.
export const withSundayNight = (sunday: WorkingInterval[]): ServiceCalendar => ({
  ...weekdaysEightToSix(),
  hours: { ...weekdaysEightToSix().hours, sun: sunday },
});

export const at = (iso: string) => new Date(iso);
