import { bucketLabel, bucketOf, bucketsBetween } from "./periods";
import type { Report } from "./types";

// Volumes (pure): sets received at the unit per customer, set class and month, in the unit's
// time zone. The queries hand in counts per UTC hour, which fall into one local month each for a
// zone whose offsets are whole hours (as Europe/London).

export interface VolumeRow {
  organisationId: number;
  customer: string;
  setClass: string;
  /** The start of a UTC hour ("2026-10-31T23:00:00Z") or any instant inside the counted time. */
  at: string;
  sets: number;
}

/** The volumes report from counts per hour. */
export function volumesReport(rows: readonly VolumeRow[], input: { timeZone: string; from: string; to: string }): Report {
  const totals = new Map<string, { customer: string; setClass: string; month: string; sets: number; organisationId: number }>();
  for (const row of rows) {
    const month = bucketOf(row.at, "month", input.timeZone);
    const key = `${row.organisationId}|${row.setClass}|${month}`;
    const entry = totals.get(key) ?? { customer: row.customer, setClass: row.setClass, month, sets: 0, organisationId: row.organisationId };
    entry.sets += row.sets;
    totals.set(key, entry);
  }
  const sorted = [...totals.values()].sort((a, b) => a.customer.localeCompare(b.customer) || a.setClass.localeCompare(b.setClass) || a.month.localeCompare(b.month));
  const customers = [...new Map(sorted.map((r) => [r.organisationId, r.customer])).entries()].sort((a, b) => a[1].localeCompare(b[1]));
  const months = bucketsBetween(input.from, input.to, "month");
  const sum = sorted.reduce((n, r) => n + r.sets, 0);
  return {
    name: "volumes",
    title: "Volumes",
    notes: [
      `${sum} set${sum === 1 ? "" : "s"} received at the unit from ${input.from} to ${input.to}, counted in the month of receipt (unit time, ${input.timeZone}).`,
    ],
    charts: [
      {
        kind: "stacked-bar",
        title: "Sets received per month, by customer",
        x: "month",
        xLabel: "Month",
        yLabel: "Sets received",
        series: customers.map(([id, name]) => ({ key: `c${id}`, label: name })),
        points: months.map((month) => {
          const point: Record<string, string | number | null> = { month: bucketLabel(month, "month") };
          for (const [id] of customers) point[`c${id}`] = sorted.filter((r) => r.organisationId === id && r.month === month).reduce((n, r) => n + r.sets, 0);
          return point;
        }),
      },
    ],
    tables: [
      {
        key: "volumes",
        title: "Sets received per customer, set class and month",
        columns: [
          { key: "customer", label: "Customer" },
          { key: "set_class", label: "Set class" },
          { key: "month", label: "Month" },
          { key: "sets", label: "Sets received", numeric: true },
        ],
        rows: sorted.map((r) => ({ customer: r.customer, set_class: r.setClass, month: r.month, sets: r.sets })),
      },
    ],
  };
}
