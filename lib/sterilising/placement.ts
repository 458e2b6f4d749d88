// Where a set goes in the steriliser chamber and whether the load fits. Pure.
//
// - Capacity: a chamber holds a whole number of sterilisation units (EN 285: 1 StU = 300 × 300 ×
//   600 mm); the load's StU (the sum of its set types' sizes) may not exceed the machine's
//   capacity_stu.
// - Placement: heavy sets go on the lower shelf so their condensate does not drip onto lighter
//   packs below, and lighter packs dry on top (common practice). The weight threshold is a setting
//   of the unit (default 7 kg, common practice — not a published limit).

export const DEFAULT_HEAVY_SET_THRESHOLD_G = 7000;

export type Shelf = "lower" | "any";

export function shelfFor(weightG: number, thresholdG: number): Shelf {
  return weightG >= thresholdG ? "lower" : "any";
}

export function placementHint(weightG: number, thresholdG: number): string {
  return shelfFor(weightG, thresholdG) === "lower"
    ? `Heavy set (${formatKg(weightG)}): place it on the lower shelf.`
    : `${formatKg(weightG)}: any shelf; keep heavier sets below it.`;
}

export function formatKg(weightG: number): string {
  return `${(weightG / 1000).toFixed(1)} kg`;
}

export function roundStu(n: number): number {
  return Math.round(n * 1000) / 1000;
}

/** Why a set of `addStu` does not fit a chamber already holding `loadStu`, or null when it fits. */
export function capacityProblem(input: { machineCode: string; capacityStu: number | null; loadStu: number; addStu: number; serial: string; loadNumber: string }): string | null {
  if (input.capacityStu === null) return null;
  const after = roundStu(input.loadStu + input.addStu);
  if (after <= input.capacityStu + 1e-9) return null;
  return `${input.machineCode} holds ${input.capacityStu} StU and load ${input.loadNumber} already has ${roundStu(input.loadStu)} StU; ${input.serial} needs ${input.addStu} StU more (${after} StU in all). Start this load and put the set in the next one.`;
}
