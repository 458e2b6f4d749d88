import { z } from "zod";
import { listQuerySchema } from "@/lib/http/paging";
import { decimalProblem, hundredthsOfKgToGrams, MAX_SIZE_STU, MAX_WEIGHT_KG, readDecimal } from "./measures";
import { PACKAGINGS, PROCESSING_FLAGS, SET_CLASSES, STERILISATION_METHODS } from "./vocabulary";

// Input shapes of the set catalogue, shared by the forms (zodResolver) and the server, which
// parses them again. The CSV import applies the same rules (lib/catalogue/import.ts).

export const CODE_PATTERN = /^[A-Z0-9][A-Z0-9-]*$/;
export const CODE_MAX = 24;
export const NAME_MAX = 120;
export const NOTES_MAX = 2000;
export const ITEM_NAME_MAX = 160;
export const ITEM_COUNT_MAX = 999;
export const ITEMS_MAX = 400;

const CONTROL_CHARACTERS = /[\u0000-\u001f\u007f]/;

/** A set type's code: short, capitals, digits and hyphens, stored in capitals. */
export const setTypeCodeSchema = z
  .string()
  .trim()
  .min(1, "Enter a code, e.g. ORTH-MAJ-01.")
  .max(CODE_MAX, `Use at most ${CODE_MAX} characters for the code.`)
  .transform((code) => code.toUpperCase())
  .refine((code) => CODE_PATTERN.test(code), "Use letters, digits and hyphens only, starting with a letter or digit, e.g. ORTH-MAJ-01.");

export const setTypeNameSchema = z
  .string()
  .trim()
  .min(1, "Enter the set type's name.")
  .max(NAME_MAX, `Use at most ${NAME_MAX} characters.`)
  .refine((n) => !CONTROL_CHARACTERS.test(n), "Names cannot contain control characters.");

/** A decimal field typed as text (or sent as a number), read exactly as hundredths. */
function decimalField(what: string, example: string, range: { maxHundredths: number; tooLarge: string }) {
  return z.union([z.string(), z.number()], { error: `Enter the ${what}, e.g. ${example}.` }).transform((value, ctx) => {
    const reading = readDecimal(typeof value === "number" ? String(value) : value);
    if (!reading.ok) {
      ctx.addIssue({
        code: "custom",
        message: reading.reason === "empty" ? `Enter the ${what}, e.g. ${example}.` : `Check the ${what}: ${decimalProblem(reading.reason)}.`,
      });
      return z.NEVER;
    }
    if (reading.hundredths === 0) {
      ctx.addIssue({ code: "custom", message: `The ${what} must be more than 0.` });
      return z.NEVER;
    }
    if (reading.hundredths > range.maxHundredths) {
      ctx.addIssue({ code: "custom", message: range.tooLarge });
      return z.NEVER;
    }
    return reading.hundredths;
  });
}

/** Kilograms with up to 2 decimals (the form's unit) → whole grams (the database's; see inGrams). */
export const weightKgSchema = decimalField("weight in kg", "4.25", {
  maxHundredths: MAX_WEIGHT_KG * 100,
  tooLarge: `A set type weighs at most ${MAX_WEIGHT_KG} kg; check the weight.`,
}).transform(hundredthsOfKgToGrams);

/** Size in sterilisation units: more than 0, at most 12, with up to 2 decimals. */
export const sizeStuSchema = decimalField("size in StU", "0.5", {
  maxHundredths: MAX_SIZE_STU * 100,
  tooLarge: `A set type takes at most ${MAX_SIZE_STU} StU; check the size.`,
}).transform((hundredths) => hundredths / 100);

const countMessage = `Enter a whole number from 1 to ${ITEM_COUNT_MAX}.`;
export const itemCountSchema = z.union([z.string(), z.number()], { error: countMessage }).transform((value, ctx) => {
  const text = typeof value === "number" ? String(value) : value.trim();
  if (!/^\d{1,6}$/.test(text) || Number(text) < 1 || Number(text) > ITEM_COUNT_MAX) {
    ctx.addIssue({ code: "custom", message: countMessage });
    return z.NEVER;
  }
  return Number(text);
});

export const itemNameSchema = z
  .string()
  .trim()
  .min(1, "Enter the instrument's name.")
  .max(ITEM_NAME_MAX, `Use at most ${ITEM_NAME_MAX} characters.`)
  .refine((n) => !CONTROL_CHARACTERS.test(n), "Names cannot contain control characters.");

export const setTypeItemSchema = z.object({ name: itemNameSchema, quantity: itemCountSchema });

const optionalNotes = z
  .string()
  .max(NOTES_MAX, `Use at most ${NOTES_MAX} characters.`)
  .nullish()
  .transform((v) => (v?.trim() ? v.trim() : null));

/** The id POST /api/files answered for the uploaded PDF; null for none. */
const optionalFileId = z
  .number({ error: "Upload the file again." })
  .int("Upload the file again.")
  .positive("Upload the file again.")
  .nullable()
  .default(null);

/** The fields a set type has, whoever edits it. */
const setTypeFieldsShape = {
  code: setTypeCodeSchema,
  name: setTypeNameSchema,
  setClass: z.enum(SET_CLASSES, { error: "Choose one of the listed set classes." }),
  packaging: z.enum(PACKAGINGS, { error: "Choose one of the listed packagings." }),
  sterilisationMethod: z.enum(STERILISATION_METHODS, { error: "Choose one of the listed methods." }),
  flags: z
    .array(z.enum(PROCESSING_FLAGS, { error: "Unknown processing flag." }))
    .default([])
    .transform((flags) => PROCESSING_FLAGS.filter((f) => flags.includes(f))),
  processingNotes: optionalNotes,
  weightKg: weightKgSchema,
  sizeStu: sizeStuSchema,
  ifuFileId: optionalFileId,
  items: z
    .array(setTypeItemSchema)
    .min(1, "List at least one instrument in the contents.")
    .max(ITEMS_MAX, `A contents list has at most ${ITEMS_MAX} lines.`),
};

/** One instrument name appears once in a contents list (the count says how many). */
function uniqueItemNames(value: { items: { name: string }[] }, ctx: z.RefinementCtx) {
  const seen = new Map<string, number>();
  value.items.forEach((item, index) => {
    const key = item.name.toLowerCase();
    const first = seen.get(key);
    if (first !== undefined) {
      ctx.addIssue({
        code: "custom",
        path: ["items", index, "name"],
        message: `Already listed on line ${first + 1}: put the total count on one line.`,
      });
    } else seen.set(key, index);
  });
}

/** The form's kilograms become the database's grams under their own name. */
function inGrams<T extends { weightKg: number }>({ weightKg, ...rest }: T): Omit<T, "weightKg"> & { weightG: number } {
  return { ...rest, weightG: weightKg };
}

export const setTypeFieldsSchema = z.object(setTypeFieldsShape).superRefine(uniqueItemNames).transform(inGrams);
export type SetTypeFieldsInput = z.input<typeof setTypeFieldsSchema>;
export type SetTypeFields = z.output<typeof setTypeFieldsSchema>;

export const createSetTypeSchema = z
  .object({ organisationId: z.coerce.number().int().positive("Choose a customer."), ...setTypeFieldsShape })
  .superRefine(uniqueItemNames)
  .transform(inGrams);
export type CreateSetTypeInput = z.input<typeof createSetTypeSchema>;

export const updateSetTypeSchema = z
  .object({ setTypeId: z.coerce.number().int().positive(), ...setTypeFieldsShape })
  .superRefine(uniqueItemNames)
  .transform(inGrams);
export type UpdateSetTypeInput = z.input<typeof updateSetTypeSchema>;

export const setTypeActiveSchema = z.object({ setTypeId: z.coerce.number().int().positive(), active: z.boolean() });

export const SET_TYPE_SORTS = ["code", "name", "set_class", "packaging", "method", "weight", "size", "items", "updated_at"] as const;

export const listSetTypesQuerySchema = listQuerySchema(SET_TYPE_SORTS, {
  organisationId: z.coerce.number().int().positive().optional(),
  setClass: z.enum(SET_CLASSES).optional(),
  packaging: z.enum(PACKAGINGS).optional(),
  method: z.enum(STERILISATION_METHODS).optional(),
  status: z.enum(["active", "inactive", "all"]).default("active"),
});
export type ListSetTypesQuery = z.infer<typeof listSetTypesQuerySchema>;
