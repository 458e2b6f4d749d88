import { describe, expect, it } from "vitest";
import { contractVersionSchema } from "@/lib/contracts/schemas";
import { zodFieldErrors } from "@/lib/errors";
import { validFormValues } from "./fixtures";

function fieldErrors(values: unknown): Record<string, string[]> {
  const result = contractVersionSchema.safeParse(values);
  if (result.success) throw new Error("expected the values to be refused");
  return zodFieldErrors(result.error);
}

describe("the contract version form schema", () => {
  it("turns the form's text into minor units, basis points and counts", () => {
    const parsed = contractVersionSchema.parse(
      validFormValues({ minimumMonthlyFee: "1,250.5", slaCreditPercent: "7.25", vat: { category: "S", ratePercent: "5.5" } }),
    );
    expect(parsed.minimumMonthlyFee).toBe(125_050);
    expect(parsed.slaCreditPercent).toBe(725);
    expect(parsed.vat).toEqual({ category: "S", ratePercent: 550 });
    expect(parsed.validUntil).toBeNull();
    expect(parsed.turnaround).toEqual({ standardHours: 24, expressHours: 5 });
    const basic = parsed.rates.find((r) => r.setClass === "basic_tray")!;
    expect(basic.bands).toEqual([
      { upToQuantity: 500, unitPrice: 950 },
      { upToQuantity: 1000, unitPrice: 890 },
      { upToQuantity: null, unitPrice: 820 },
    ]);
    expect(parsed.surcharges).toEqual([
      { kind: "express", basis: "percent_of_fee", basisPoints: 5000 },
      { kind: "out_of_hours", basis: "per_set", amountMinor: 1500 },
    ]);
  });

  it("refuses bands that do not go up, naming the class and the band", () => {
    const values = validFormValues();
    values.rates[1]!.bands[1]!.upToQuantity = "400";
    const errors = fieldErrors(values);
    expect(Object.keys(errors)).toEqual(["rates.1.bands.1.upToQuantity"]);
    expect(errors["rates.1.bands.1.upToQuantity"]![0]).toBe(
      "Basic tray (up to 25 instruments), band 2: “up to” must be more than band 1's 500; bands go up in order.",
    );
  });

  it("keeps only the last band open-ended", () => {
    const values = validFormValues();
    values.rates[1]!.bands[0]!.upToQuantity = "";
    values.rates[1]!.bands[2]!.upToQuantity = "2000";
    const errors = fieldErrors(values);
    expect(errors["rates.1.bands.0.upToQuantity"]![0]).toMatch(/band 1: enter the number of sets .* only the last band is open-ended/);
    expect(errors["rates.1.bands.2.upToQuantity"]![0]).toMatch(/band 3: the last band is open-ended/);
  });

  it("needs a rate for every set class", () => {
    const values = validFormValues();
    values.rates = values.rates.filter((r) => r.setClass !== "loaner_set");
    const errors = fieldErrors(values);
    expect(errors["rates"]![0]).toMatch(/Give a price for Loaner set \(supplier-owned\)/);
    const none = validFormValues();
    none.rates[3]!.bands = [];
    expect(fieldErrors(none)["rates.3.bands"]![0]).toBe("Specialist tray (powered, micro or scope): give at least one price band.");
  });

  it("wants express quicker than standard", () => {
    const errors = fieldErrors(validFormValues({ turnaround: { standardHours: "24", expressHours: "24" } }));
    expect(errors).toEqual({ "turnaround.expressHours": ["Express must be quicker than standard: fewer than 24 hours."] });
  });

  it("accepts only ISO 4217 currencies with two decimals", () => {
    // JPY has no minor unit and BHD three (ISO 4217 list of currency codes, minor unit column).
    expect(fieldErrors(validFormValues({ currency: "JPY" }))["currency"]![0]).toMatch(/JPY has 0 decimal places/);
    expect(fieldErrors(validFormValues({ currency: "BHD" }))["currency"]![0]).toMatch(/BHD has 3 decimal places/);
    expect(fieldErrors(validFormValues({ currency: "POUNDS" }))["currency"]![0]).toMatch(/three-letter ISO 4217 code/);
    expect(contractVersionSchema.parse(validFormValues({ currency: "eur" })).currency).toBe("EUR");
  });

  it("refuses money with more than two decimals and percentages out of range", () => {
    const errors = fieldErrors(validFormValues({ minimumMonthlyFee: "12.345", slaCreditPercent: "120", vat: { category: "S", ratePercent: "20.125" } }));
    expect(Object.keys(errors).sort()).toEqual(["minimumMonthlyFee", "slaCreditPercent", "vat.ratePercent"]);
    expect(errors["slaCreditPercent"]![0]).toBe("The credit for a late set can be at most 100 %.");
  });

  it("ties the VAT rate to its category", () => {
    expect(fieldErrors(validFormValues({ vat: { category: "S", ratePercent: "0" } }))["vat.ratePercent"]![0]).toMatch(/above 0 %/);
    expect(fieldErrors(validFormValues({ vat: { category: "Z", ratePercent: "20" } }))["vat.ratePercent"]![0]).toMatch(/0 %/);
    expect(contractVersionSchema.parse(validFormValues({ vat: { category: "Z", ratePercent: "0" } })).vat.ratePercent).toBe(0);
  });

  it("needs the amount or percentage its basis asks for, and each surcharge once", () => {
    const values = validFormValues();
    values.surcharges = [
      { kind: "heavy_soil", basis: "per_set", amount: "", percent: "10" },
      { kind: "express", basis: "percent_of_fee", amount: "", percent: "50" },
      { kind: "express", basis: "per_set", amount: "5.00", percent: "" },
    ];
    const errors = fieldErrors(values);
    expect(errors["surcharges.0.amount"]![0]).toBe("Heavy soil or no pre-clean: enter the amount charged per set.");
    expect(errors["surcharges.2.kind"]![0]).toBe("Express turnaround is listed twice; keep one line per surcharge.");
  });

  it("checks the dates even while other fields need attention", () => {
    const errors = fieldErrors(validFormValues({ validFrom: "2027-03-01", validUntil: "2027-02-28", reference: "" }));
    expect(Object.keys(errors).sort()).toEqual(["reference", "validUntil"]);
    expect(errors["validUntil"]![0]).toBe("The last day must be on or after the first day (2027-03-01).");
    expect(fieldErrors(validFormValues({ validFrom: "2027-02-30" }))["validFrom"]![0]).toMatch(/real date/);
  });

  it("checks the service calendar with the turnaround clock's own schema", () => {
    const values = validFormValues();
    values.serviceCalendar.hours.mon = [{ start: "09:00", end: "08:00" }];
    values.serviceCalendar.holidays = ["2027-13-01"];
    const errors = fieldErrors(values);
    expect(errors["serviceCalendar.hours.mon.0.end"]![0]).toMatch(/must be after start 09:00/);
    expect(errors["serviceCalendar.holidays.0"]![0]).toMatch(/not a calendar date/);
  });
});
