import { formatStu, formatWeight } from "./measures";
import {
  PACKAGING_LABELS,
  type Packaging,
  PROCESSING_FLAG_LABELS,
  type ProcessingFlag,
  SET_CLASS_LABELS,
  type SetClass,
  STERILISATION_METHOD_LABELS,
  type SterilisationMethod,
} from "./vocabulary";

// What differs between two versions of a set type, in words for the import summary and the audit
// log. Pure.

export interface SetTypeItemValues {
  name: string;
  quantity: number;
}

export interface SetTypeValues {
  code: string;
  name: string;
  setClass: SetClass;
  packaging: Packaging;
  sterilisationMethod: SterilisationMethod;
  flags: readonly ProcessingFlag[];
  processingNotes: string | null;
  weightG: number;
  sizeStu: number;
  items: readonly SetTypeItemValues[];
}

const plural = (n: number, one: string, many = `${one}s`) => `${n} ${n === 1 ? one : many}`;

/** The contents-list differences: lines added or removed, counts changed, order changed. */
export function describeItemChanges(before: readonly SetTypeItemValues[], after: readonly SetTypeItemValues[]): string | null {
  const old = new Map(before.map((i) => [i.name, i.quantity]));
  const next = new Map(after.map((i) => [i.name, i.quantity]));
  const added = after.filter((i) => !old.has(i.name)).length;
  const removed = before.filter((i) => !next.has(i.name)).length;
  const recounted = after.filter((i) => old.has(i.name) && old.get(i.name) !== i.quantity).length;
  const keptOld = before.filter((i) => next.has(i.name)).map((i) => i.name);
  const keptNew = after.filter((i) => old.has(i.name)).map((i) => i.name);
  const reordered = keptOld.some((name, index) => keptNew[index] !== name);
  const parts: string[] = [];
  if (added) parts.push(`${plural(added, "line")} added`);
  if (removed) parts.push(`${plural(removed, "line")} removed`);
  if (recounted) parts.push(`${plural(recounted, "count")} changed`);
  if (reordered) parts.push("order changed");
  return parts.length ? `contents: ${parts.join(", ")}` : null;
}

/** Each changed field as "field: old → new"; an empty list when nothing changed. */
export function describeChanges(before: SetTypeValues, after: SetTypeValues): string[] {
  const changes: string[] = [];
  const field = (label: string, a: string, b: string) => {
    if (a !== b) changes.push(`${label}: ${a} → ${b}`);
  };
  field("code", before.code, after.code);
  field("name", before.name, after.name);
  field("set class", SET_CLASS_LABELS[before.setClass] ?? before.setClass, SET_CLASS_LABELS[after.setClass] ?? after.setClass);
  field("packaging", PACKAGING_LABELS[before.packaging], PACKAGING_LABELS[after.packaging]);
  field("method", STERILISATION_METHOD_LABELS[before.sterilisationMethod], STERILISATION_METHOD_LABELS[after.sterilisationMethod]);
  const addedFlags = after.flags.filter((f) => !before.flags.includes(f));
  const removedFlags = before.flags.filter((f) => !after.flags.includes(f));
  if (addedFlags.length || removedFlags.length) {
    const words = [
      ...addedFlags.map((f) => `+ ${PROCESSING_FLAG_LABELS[f].toLowerCase()}`),
      ...removedFlags.map((f) => `− ${PROCESSING_FLAG_LABELS[f].toLowerCase()}`),
    ];
    changes.push(`processing: ${words.join(", ")}`);
  }
  if (before.weightG !== after.weightG) changes.push(`weight: ${formatWeight(before.weightG)} → ${formatWeight(after.weightG)}`);
  if (Math.round(before.sizeStu * 100) !== Math.round(after.sizeStu * 100)) {
    changes.push(`size: ${formatStu(before.sizeStu)} → ${formatStu(after.sizeStu)}`);
  }
  if ((before.processingNotes ?? "") !== (after.processingNotes ?? "")) {
    changes.push(after.processingNotes ? (before.processingNotes ? "notes changed" : "notes added") : "notes removed");
  }
  const items = describeItemChanges(before.items, after.items);
  if (items) changes.push(items);
  return changes;
}
