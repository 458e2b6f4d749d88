import type { FieldErrors, UseFormReturn } from "react-hook-form";
import { get } from "react-hook-form";
import type { ContractVersionFormValues, ContractVersionInput } from "@/lib/contracts/schemas";

// Shared by the contract form and its editors.

export type FormValues = ContractVersionFormValues;
export type FormOutput = ContractVersionInput;
export type ContractUseForm = UseFormReturn<FormValues, unknown, FormOutput>;

/** The message of the error at a dotted path, including a list's own error. */
export function errorAt(errors: FieldErrors<FormValues>, path: string): string | undefined {
  const error = get(errors, path) as { message?: unknown; root?: { message?: unknown } } | undefined;
  const message = error?.message ?? error?.root?.message;
  return typeof message === "string" ? message : undefined;
}

/** The element id of a form path: "rates.1.bands.0.unitPrice" → "contract-rates-1-bands-0-unitPrice". */
export function idOf(path: string): string {
  return `contract-${path.replaceAll(".", "-")}`;
}

/** aria attributes of an input whose error shows under it (see Field). */
export function invalidProps(errors: FieldErrors<FormValues>, path: string) {
  const message = errorAt(errors, path);
  return { "aria-invalid": !!message, "aria-describedby": message ? `${idOf(path)}-error` : undefined };
}
