import { z } from "zod";
import { TurnaroundError } from "./errors";
import { isKnownTimeZone } from "./local-time";
import { type ServiceDays, serviceDaysFor } from "./service-days";

export const WEEKDAYS = ["mon", "tue", "wed", "thu", "fri", "sat", "sun"] as const;
export type Weekday = (typeof WEEKDAYS)[number];

/**
 * One stretch of working time on a weekday, as local wall-clock times "HH:MM".
 * `start` is 00:00–23:59; `end` is 00:01–24:00 and after `start`. A stretch never runs past
 * midnight: 22:00–06:00 is written as 22:00–24:00 on one day and 00:00–06:00 on the next.
 */
export interface WorkingInterval {
  start: string;
  end: string;
}

/**
 * The unit's service calendar: when the turnaround clock runs.
 * - `timeZone`: IANA name (e.g. "Europe/London"); all hours and holidays are local to it.
 * - `hours`: working intervals per weekday; an empty list means closed all day.
 *   Monday to Sunday 00:00–24:00 is a 24/7 calendar.
 * - `holidays`: local dates "YYYY-MM-DD" closed all day, whatever the weekday.
 */
export interface ServiceCalendar {
  timeZone: string;
  hours: Record<Weekday, WorkingInterval[]>;
  holidays: string[];
}

const START_RE = /^(?:[01]\d|2[0-3]):[0-5]\d$/;
const END_RE = /^(?:(?:[01]\d|2[0-3]):[0-5]\d|24:00)$/;

// Minutes after local midnight of an "HH:MM" text already checked by the schema.
export function clockMinutes(text: string): number {
  return Number(text.slice(0, 2)) * 60 + Number(text.slice(3, 5));
}

const shown = (value: unknown) => (typeof value === "string" ? `"${value}"` : String(value));

const workingIntervalSchema = z
  .strictObject({
    start: z
      .string({ error: "start must be a time of day written HH:MM" })
      .regex(START_RE, {
        error: (issue) => `start ${shown(issue.input)} must be a time of day written HH:MM, from 00:00 to 23:59`,
      }),
    end: z
      .string({ error: "end must be a time of day written HH:MM" })
      .regex(END_RE, {
        error: (issue) => `end ${shown(issue.input)} must be a time of day written HH:MM, from 00:01 to 24:00`,
      }),
  })
  .check((ctx) => {
    const { start, end } = ctx.value;
    if (clockMinutes(end) <= clockMinutes(start)) {
      ctx.issues.push({
        code: "custom",
        input: ctx.value,
        path: ["end"],
        message:
          `end ${end} must be after start ${start}; an interval past midnight is written as two ` +
          `intervals, one ending at 24:00 and one starting at 00:00 the next day`,
      });
    }
  });

const dayHoursSchema = (day: Weekday) =>
  z
    .array(workingIntervalSchema, {
      error: `hours.${day} must be a list of {start, end} intervals (an empty list means closed)`,
    })
    .check((ctx) => {
      const sorted = ctx.value
        .map((interval, index) => ({ ...interval, index }))
        .filter((i) => START_RE.test(i.start) && END_RE.test(i.end))
        .sort((a, b) => clockMinutes(a.start) - clockMinutes(b.start));
      for (let k = 1; k < sorted.length; k++) {
        const previous = sorted[k - 1];
        const current = sorted[k];
        if (clockMinutes(current.start) < clockMinutes(previous.end)) {
          ctx.issues.push({
            code: "custom",
            input: ctx.value,
            path: [current.index],
            message:
              `${day} intervals ${previous.start}–${previous.end} and ${current.start}–${current.end} ` +
              `overlap; merge them or move one`,
          });
        }
      }
    });

const weekHoursSchema = z
  .strictObject(
    {
      mon: dayHoursSchema("mon"),
      tue: dayHoursSchema("tue"),
      wed: dayHoursSchema("wed"),
      thu: dayHoursSchema("thu"),
      fri: dayHoursSchema("fri"),
      sat: dayHoursSchema("sat"),
      sun: dayHoursSchema("sun"),
    },
    {
      error: (issue) =>
        issue.code === "unrecognized_keys"
          ? `hours has unknown weekday ${issue.keys.map((k) => `"${k}"`).join(", ")}; the weekdays are ${WEEKDAYS.join(", ")}`
          : "hours must give the working intervals of each weekday, mon to sun",
    },
  )
  .check((ctx) => {
    if (WEEKDAYS.every((day) => ctx.value[day].length === 0)) {
      ctx.issues.push({
        code: "custom",
        input: ctx.value,
        message: "the calendar has no working hours on any weekday; give at least one interval",
      });
    }
  });

/** Validates a service calendar; its messages name the field and say what to fix. */
export const serviceCalendarSchema = z.strictObject(
  {
    timeZone: z
      .string({ error: 'timeZone must be an IANA time zone name such as "Europe/London"' })
      .refine(isKnownTimeZone, {
        error: (issue) =>
          `timeZone ${shown(issue.input)} is not a time zone this system knows; ` +
          `use an IANA name such as "Europe/London"`,
      }),
    hours: weekHoursSchema,
    holidays: z.array(
      z.iso.date({
        error: (issue) => `holiday ${shown(issue.input)} is not a calendar date written YYYY-MM-DD`,
      }),
      { error: 'holidays must be a list of local dates written YYYY-MM-DD (e.g. "2026-12-25")' },
    ),
  },
  {
    error: (issue) =>
      issue.code === "unrecognized_keys"
        ? `a service calendar has only timeZone, hours and holidays, not ${issue.keys.map((k) => `"${k}"`).join(", ")}`
        : "a service calendar must be an object with timeZone, hours and holidays",
  },
);

// The validated schema output must be usable wherever a ServiceCalendar is expected.
const _schemaMatchesType: (value: z.output<typeof serviceCalendarSchema>) => ServiceCalendar = (value) => value;

/** A calendar checked once and turned into numbers for the clock. */
export interface CompiledCalendar {
  timeZone: string;
  /** Working intervals in minutes after local midnight, sorted; index 0 is Sunday, as Date.getUTCDay. */
  week: ReadonlyArray<ReadonlyArray<readonly [number, number]>>;
  /** Holidays as local day numbers (days since 1970-01-01). */
  holidays: ReadonlySet<number>;
  /** Longest possible run of consecutive days without working time; more means something is wrong. */
  maxClosedRun: number;
  /** Each local day's working spans and midnight, shared by calendars with the same content. */
  days: ServiceDays;
}

// Compiled calendars per calendar object, with the JSON they were compiled from so that a calendar
// changed in place is compiled again.
const compiled = new WeakMap<object, { json: string; calendar: CompiledCalendar }>();

function snapshot(value: unknown): string | undefined {
  try {
    return JSON.stringify(value);
  } catch {
    return undefined;
  }
}

// Day number (days since 1970-01-01) of a "YYYY-MM-DD" text already checked by the schema.
export function dayNumberOf(isoDate: string): number {
  const [y, m, d] = isoDate.split("-").map(Number);
  return Date.UTC(y, m - 1, d) / 86_400_000;
}

// Checks a calendar (throwing TurnaroundError "invalid_calendar" with every issue) and turns it
// into numbers, once per calendar object and content.
export function compileCalendar(calendar: ServiceCalendar): CompiledCalendar {
  const isObject = typeof calendar === "object" && calendar !== null;
  const json = isObject ? snapshot(calendar) : undefined;
  const cached = isObject ? compiled.get(calendar) : undefined;
  if (cached && cached.json === json) return cached.calendar;

  const parsed = serviceCalendarSchema.safeParse(calendar);
  if (!parsed.success) {
    const issues = parsed.error.issues.map((issue) => ({ path: issue.path.join("."), message: issue.message }));
    const summary = issues.map((i) => (i.path ? `${i.path}: ${i.message}` : i.message)).join("; ");
    throw new TurnaroundError("invalid_calendar", `The service calendar is not valid: ${summary}`, issues);
  }
  const value = parsed.data;
  const sundayFirst: Weekday[] = ["sun", "mon", "tue", "wed", "thu", "fri", "sat"];
  const holidays = new Set(value.holidays.map(dayNumberOf));
  const week = sundayFirst.map((day) =>
    value.hours[day].map((i) => [clockMinutes(i.start), clockMinutes(i.end)] as const).sort((a, b) => a[0] - b[0]),
  );
  const result: CompiledCalendar = {
    timeZone: value.timeZone,
    week,
    holidays,
    // With one open weekday each holiday on it closes a whole week; a week more covers the
    // six closed weekdays and a day whose hours fall into a daylight-saving gap.
    maxClosedRun: 7 * (holidays.size + 2),
    days: serviceDaysFor({ timeZone: value.timeZone, week, holidays }),
  };
  if (isObject && json !== undefined) compiled.set(calendar, { json, calendar: result });
  return result;
}
