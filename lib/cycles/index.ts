// Cycle records of washer-disinfectors and steam sterilisers: parsing, figures and checks.
// Every check here is advisory; release decisions rest with the unit's qualified staff, its
// validated procedures and local regulations.

export * from "./record";
export * from "./errors";
export { classifyHeader, headerWords, type HeaderRole } from "./headers";
export * from "./units";
export * from "./parse";
export { longestRun, sumOverIntervals, type SampleRun } from "./intervals";
export * from "./a0";
export * from "./washer";
export * from "./if97";
export * from "./f0";
export * from "./sterilizer";
export * from "./synth";
export * from "./csv";
export * from "./lifecycle";
