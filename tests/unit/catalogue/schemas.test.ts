import { describe, expect, it } from "vitest";
import { zodFieldErrors } from "@/lib/errors";
import { createSetTypeSchema, listSetTypesQuerySchema, setTypeFieldsSchema } from "@/lib/catalogue/schemas";

const valid = {
  code: " orth-maj-01 ",
  name: "Major orthopaedic set",
  setClass: "major_tray",
  packaging: "rigid_container",
  sterilisationMethod: "steam_134",
  flags: ["ultrasonic", "dismantle"],
  processingNotes: "  ",
  weightKg: "10.4",
  sizeStu: "1",
  items: [
    { name: "Bone lever, Hohmann 18 mm", quantity: "4" },
    { name: "Mallet, nylon head 500 g", quantity: 1 },
  ],
};

function fieldErrors(input: unknown) {
  const parsed = setTypeFieldsSchema.safeParse(input);
  expect(parsed.success).toBe(false);
  return parsed.success ? {} : zodFieldErrors(parsed.error);
}

describe("the set type form's schema", () => {
  it("normalises what the form sends: capital code, grams, flags in order, blank notes as none", () => {
    expect(setTypeFieldsSchema.parse(valid)).toEqual({
      code: "ORTH-MAJ-01",
      name: "Major orthopaedic set",
      setClass: "major_tray",
      packaging: "rigid_container",
      sterilisationMethod: "steam_134",
      flags: ["dismantle", "ultrasonic"],
      processingNotes: null,
      weightG: 10_400,
      sizeStu: 1,
      ifuFileId: null,
      items: [
        { name: "Bone lever, Hohmann 18 mm", quantity: 4 },
        { name: "Mallet, nylon head 500 g", quantity: 1 },
      ],
    });
  });

  it("takes the weight in kg with at most 2 decimals and the size within 0 < StU ≤ 12", () => {
    expect(fieldErrors({ ...valid, weightKg: "4.255" }).weightKg).toEqual(["Check the weight in kg: use at most 2 decimals."]);
    expect(fieldErrors({ ...valid, weightKg: "0" }).weightKg).toEqual(["The weight in kg must be more than 0."]);
    expect(fieldErrors({ ...valid, weightKg: "" }).weightKg).toEqual(["Enter the weight in kg, e.g. 4.25."]);
    expect(fieldErrors({ ...valid, sizeStu: "12.01" }).sizeStu).toEqual(["A set type takes at most 12 StU; check the size."]);
    expect(fieldErrors({ ...valid, sizeStu: "0.125" }).sizeStu).toEqual(["Check the size in StU: use at most 2 decimals."]);
    expect(setTypeFieldsSchema.parse({ ...valid, sizeStu: "12", weightKg: 0.01 })).toMatchObject({ sizeStu: 12, weightG: 10 });
  });

  it("puts contents errors under the row and field they belong to", () => {
    const errors = fieldErrors({ ...valid, items: [{ name: "Gallipot", quantity: "-2" }, { name: "", quantity: "1.5" }] });
    expect(errors).toEqual({
      "items.0.quantity": ["Enter a whole number from 1 to 999."],
      "items.1.name": ["Enter the instrument's name."],
      "items.1.quantity": ["Enter a whole number from 1 to 999."],
    });
    expect(fieldErrors({ ...valid, items: [] }).items).toEqual(["List at least one instrument in the contents."]);
    expect(fieldErrors({ ...valid, items: [{ name: "Gallipot", quantity: 1 }, { name: "gallipot", quantity: 2 }] })).toEqual({
      "items.1.name": ["Already listed on line 1: put the total count on one line."],
    });
  });

  it("refuses codes with other characters and unknown choices", () => {
    expect(fieldErrors({ ...valid, code: "ORTH/01" }).code).toEqual([
      "Use letters, digits and hyphens only, starting with a letter or digit, e.g. ORTH-MAJ-01.",
    ]);
    const errors = fieldErrors({ ...valid, setClass: "tray", packaging: "box", sterilisationMethod: "gas", flags: ["rinse"] });
    expect(Object.keys(errors).sort()).toEqual(["flags.0", "packaging", "setClass", "sterilisationMethod"]);
  });

  it("needs a customer to create into", () => {
    const parsed = createSetTypeSchema.safeParse({ ...valid, organisationId: "" });
    expect(parsed.success).toBe(false);
  });
});

describe("the list query", () => {
  it("defaults to active set types sorted by code and refuses unknown filters", () => {
    expect(listSetTypesQuerySchema.parse({})).toMatchObject({ status: "active", sort: "code", dir: "asc", page: 1 });
    expect(listSetTypesQuerySchema.safeParse({ setClass: "bucket" }).success).toBe(false);
    expect(listSetTypesQuerySchema.safeParse({ sort: "organisation_id; drop table" }).success).toBe(false);
  });
});
