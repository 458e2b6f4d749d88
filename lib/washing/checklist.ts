import type { ProcessingFlag } from "@/lib/catalogue/vocabulary";

// The steps a technician confirms after washing a set by hand. Brushing and rinsing apply to
// every set; dismantling and flushing lumens only where the set type's processing flags say so.
// The steps follow common practice for manual cleaning; the set's instructions for use and the
// unit's validated manual procedure decide what is actually done.

export const MANUAL_WASH_STEPS = ["dismantled", "brushed", "rinsed", "lumensFlushed"] as const;
export type ManualWashStep = (typeof MANUAL_WASH_STEPS)[number];

export const MANUAL_WASH_STEP_LABELS: Record<ManualWashStep, string> = {
  dismantled: "Dismantled into its parts",
  brushed: "Brushed and cleaned under the surface of the detergent solution",
  rinsed: "Rinsed free of detergent",
  lumensFlushed: "Every lumen and channel flushed",
};

/** The steps to confirm for a set type with these flags, in the order they are done. */
export function manualWashSteps(flags: readonly ProcessingFlag[]): ManualWashStep[] {
  return MANUAL_WASH_STEPS.filter((step) => {
    if (step === "dismantled") return flags.includes("dismantle");
    if (step === "lumensFlushed") return flags.includes("lumens_to_flush");
    return true;
  });
}

/** The steps required for these flags that are not confirmed. */
export function unconfirmedSteps(flags: readonly ProcessingFlag[], confirmed: Partial<Record<ManualWashStep, boolean>>): ManualWashStep[] {
  return manualWashSteps(flags).filter((step) => confirmed[step] !== true);
}
