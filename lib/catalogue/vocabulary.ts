// The words of the set catalogue: the classes a set is billed by, how it is packed, how it is
// sterilised, and what the stations must know before processing it.

export const SET_CLASSES = [
  "single_instrument",
  "basic_tray",
  "major_tray",
  "specialist_tray",
  "rigid_container",
  "dental_cassette",
  "loaner_set",
] as const;
export type SetClass = (typeof SET_CLASSES)[number];

export const SET_CLASS_LABELS: Record<SetClass, string> = {
  single_instrument: "Single pouched instrument",
  basic_tray: "Basic tray (up to 25 instruments)",
  major_tray: "Major tray (over 25 instruments)",
  specialist_tray: "Specialist tray (powered, micro or scope)",
  rigid_container: "Rigid container set",
  dental_cassette: "Dental cassette",
  loaner_set: "Loaner set (supplier-owned)",
};

export const PACKAGINGS = ["wrap", "rigid_container", "single_pouch", "double_pouch"] as const;
export type Packaging = (typeof PACKAGINGS)[number];
export const PACKAGING_LABELS: Record<Packaging, string> = {
  wrap: "Wrapped tray",
  rigid_container: "Rigid container",
  single_pouch: "Single pouch",
  double_pouch: "Double pouch",
};

export const STERILISATION_METHODS = ["steam_134", "steam_121", "low_temperature"] as const;
export type SterilisationMethod = (typeof STERILISATION_METHODS)[number];
export const STERILISATION_METHOD_LABELS: Record<SterilisationMethod, string> = {
  steam_134: "Steam 134 °C",
  steam_121: "Steam 121 °C",
  low_temperature: "Low-temperature",
};

export const PROCESSING_FLAGS = ["dismantle", "ultrasonic", "manual_wash_only", "lumens_to_flush"] as const;
export type ProcessingFlag = (typeof PROCESSING_FLAGS)[number];
export const PROCESSING_FLAG_LABELS: Record<ProcessingFlag, string> = {
  dismantle: "Dismantle before washing",
  ultrasonic: "Ultrasonic clean",
  manual_wash_only: "Manual wash only",
  lumens_to_flush: "Lumens to flush",
};

export function isSetClass(value: string): value is SetClass {
  return (SET_CLASSES as readonly string[]).includes(value);
}

export function isPackaging(value: string): value is Packaging {
  return (PACKAGINGS as readonly string[]).includes(value);
}

export function isSterilisationMethod(value: string): value is SterilisationMethod {
  return (STERILISATION_METHODS as readonly string[]).includes(value);
}

export function isProcessingFlag(value: string): value is ProcessingFlag {
  return (PROCESSING_FLAGS as readonly string[]).includes(value);
}

/** Loaner sets travel with their supplier's instructions for use; bookings refuse them without one. */
export function expectsIfu(setClass: string): boolean {
  return setClass === "loaner_set";
}
