import { z } from "zod";

// Input shapes of the vans, shifts and planning forms, shared by the client forms and the server
// actions, which parse them again.

const text = (label: string, max: number) =>
  z
    .string()
    .trim()
    .min(1, `Enter the ${label}.`)
    .max(max, `Use at most ${max} characters.`)
    .refine((v) => !/[\u0000-\u001f<>]/.test(v), "Remove control characters and angle brackets.");

const carts = (label: string) =>
  z.coerce
    .number({ error: `Enter how many carts the ${label} compartment holds.` })
    .int("Use a whole number of carts.")
    .min(0, "Use zero or more carts.")
    .max(40, "A van holds at most 40 carts per compartment here.");

export const vanSchema = z
  .object({
    code: z
      .string()
      .trim()
      .transform((v) => v.toUpperCase())
      .pipe(z.string().regex(/^[A-Z0-9]{1,8}(?:-[A-Z0-9]{1,8})?$/, "Use capitals and digits with at most one dash, e.g. V2.")),
    name: text("van's name", 60),
    registration: text("registration", 16),
    soiledCapacityCarts: carts("soiled"),
    cleanCapacityCarts: carts("clean"),
    active: z.boolean().default(true),
  })
  .refine((v) => v.soiledCapacityCarts + v.cleanCapacityCarts > 0, { path: ["cleanCapacityCarts"], message: "A van must hold at least one cart." });

export type VanInput = z.input<typeof vanSchema>;
export type VanFields = z.output<typeof vanSchema>;

export const updateVanSchema = vanSchema.and(z.object({ id: z.number().int().positive() }));

export const daySchema = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, "Pick a day as YYYY-MM-DD.")
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && new Date(`${d}T00:00:00Z`).toISOString().slice(0, 10) === d, "That day does not exist.");

const clock = (label: string) => z.string().regex(/^([01]\d|2[0-3]):[0-5]\d$|^24:00$/, `Enter the ${label} as a time like 07:30.`);
const optionalClock = (label: string) => z.union([z.literal(""), clock(label)]).default("");

/** "07:30" → 450. */
export function clockToMinutes(text: string): number {
  return Number(text.slice(0, 2)) * 60 + Number(text.slice(3, 5));
}

/** 450 → "07:30". */
export function minutesToClock(minutes: number): string {
  const m = Math.round(minutes);
  return `${String(Math.floor(m / 60)).padStart(2, "0")}:${String(m % 60).padStart(2, "0")}`;
}

export const shiftSchema = z
  .object({
    day: daySchema,
    userId: z.coerce.number().int().positive("Choose the driver."),
    vanId: z.union([z.literal(""), z.coerce.number().int().positive()]).default(""),
    start: clock("start"),
    end: clock("end"),
    breakEarliest: optionalClock("break's earliest start"),
    breakLatest: optionalClock("break's latest start"),
    breakMinutes: z.coerce.number({ error: "Enter the break in minutes (0 for none)." }).int("Use whole minutes.").min(0, "Use 0 or more minutes.").max(120, "Use at most 120 minutes."),
  })
  .superRefine((s, ctx) => {
    const start = clockToMinutes(s.start);
    const end = clockToMinutes(s.end);
    if (end <= start) ctx.addIssue({ code: "custom", path: ["end"], message: "The shift must end after it starts." });
    if (s.breakMinutes > 0) {
      if (!s.breakEarliest) ctx.addIssue({ code: "custom", path: ["breakEarliest"], message: "Enter when the break may start at the earliest." });
      if (!s.breakLatest) ctx.addIssue({ code: "custom", path: ["breakLatest"], message: "Enter when the break must start at the latest." });
      if (s.breakEarliest && s.breakLatest) {
        const a = clockToMinutes(s.breakEarliest);
        const b = clockToMinutes(s.breakLatest);
        if (b < a) ctx.addIssue({ code: "custom", path: ["breakLatest"], message: "The latest start cannot be before the earliest." });
        if (a < start || b + s.breakMinutes > end) ctx.addIssue({ code: "custom", path: ["breakEarliest"], message: "The break must fall inside the shift." });
      }
    }
  });

export type ShiftInput = z.input<typeof shiftSchema>;
export type ShiftFields = z.output<typeof shiftSchema>;

export const deleteShiftSchema = z.object({ id: z.number().int().positive() });

export const planDaySchema = z.object({
  day: daySchema,
  seed: z.coerce.number().int("Use a whole number as the seed.").min(1, "Use a seed of 1 or more.").max(2_147_483_647).default(1),
});

export const moveStopSchema = z.object({
  stopId: z.number().int().positive(),
  /** null takes the stop off the runs. */
  vanId: z.number().int().positive().nullable(),
  /** 1-based place in the van's run; past the end means last. */
  position: z.number().int().min(1).max(500).default(500),
});

export const lockStopSchema = z.object({ stopId: z.number().int().positive(), locked: z.boolean() });

export const publishSchema = z.object({ day: daySchema });
