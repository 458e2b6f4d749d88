import { SET_CLASSES } from "@/lib/catalogue/vocabulary";
import { blankContractValues, type ContractFormValues } from "@/lib/contracts/form-values";

// Form values of a valid contract version, to break one field at a time. Prices are invented.
export function validFormValues(overrides: Partial<ContractFormValues> = {}): ContractFormValues {
  const values = blankContractValues("Europe/London", 7);
  values.reference = "TEST-2027-01";
  values.validFrom = "2027-01-01";
  values.rates = SET_CLASSES.map((setClass) =>
    setClass === "basic_tray"
      ? {
          setClass,
          bands: [
            { upToQuantity: "500", unitPrice: "9.50" },
            { upToQuantity: "1000", unitPrice: "8.90" },
            { upToQuantity: "", unitPrice: "8.20" },
          ],
        }
      : { setClass, bands: [{ upToQuantity: "", unitPrice: "12.00" }] },
  );
  values.surcharges = [
    { kind: "express", basis: "percent_of_fee", amount: "", percent: "50" },
    { kind: "out_of_hours", basis: "per_set", amount: "15.00", percent: "" },
  ];
  return { ...values, ...overrides };
}
