import { percent, type Report } from "./types";

// Expected intake against steriliser capacity (pure), for the next days.
//
// Decisions:
// - Intake of a day is the StU (EN 285 sterilisation units, set_types.size_stu) of the sets on
//   pickups booked for collection that local day, assuming they reach the unit the day they are
//   collected.
// - A day's capacity is the chamber size of each active steriliser (machines.capacity_stu, whole
//   StU) times an assumed number of loads per steriliser per day. That number is an assumption
//   the page lets the reader change (DEFAULT_LOADS_PER_DAY), not a measured figure.

/** Loads per steriliser per day assumed when the reader gives none: our own assumption, not a published figure. */
export const DEFAULT_LOADS_PER_DAY = 8;

export interface IntakeRow {
  /** Local date of collection. */
  day: string;
  sets: number;
  stu: number;
}

export interface SterilizerCapacity {
  code: string;
  capacityStu: number;
}

/** The capacity report over the given days (every day listed, booked or not). */
export function capacityReport(input: { days: readonly string[]; intake: readonly IntakeRow[]; sterilisers: readonly SterilizerCapacity[]; loadsPerDay: number }): Report {
  const chamber = input.sterilisers.reduce((n, s) => n + s.capacityStu, 0);
  const capacity = chamber * input.loadsPerDay;
  const byDay = new Map(input.days.map((d) => [d, { sets: 0, stu: 0 }]));
  for (const row of input.intake) {
    const entry = byDay.get(row.day);
    if (!entry) continue;
    entry.sets += row.sets;
    entry.stu += row.stu;
  }
  const rows = input.days.map((day) => {
    const e = byDay.get(day)!;
    // StU sizes are decimals (0.25, 0.5): sums are shown to two decimals.
    e.stu = Math.round(e.stu * 100) / 100;
    return { day, sets: e.sets, intake_stu: e.stu, capacity_stu: capacity, load_pct: percent(e.stu, capacity), over: e.stu > capacity ? "over capacity" : "" };
  });
  return {
    name: "capacity",
    title: "Expected intake and steriliser capacity",
    notes: [
      `Capacity per day: ${input.sterilisers.length} steriliser${input.sterilisers.length === 1 ? "" : "s"} (${input.sterilisers.map((s) => `${s.code} ${s.capacityStu} StU`).join(", ") || "none recorded"}) × ${input.loadsPerDay} loads per day = ${capacity} StU.`,
      "The loads per day are an assumption you can change above, not a measurement; intake is the sets on pickups booked for collection that day, in sterilisation units (StU, EN 285).",
    ],
    charts: [
      {
        kind: "bar",
        title: "Booked intake per day (StU) against capacity",
        x: "day",
        xLabel: "Day of collection",
        yLabel: "StU",
        series: [{ key: "intake_stu", label: "Booked intake" }],
        points: rows.map((r) => ({ day: r.day.slice(5), intake_stu: r.intake_stu })),
        reference: { value: capacity, label: `Capacity ${capacity} StU` },
      },
    ],
    tables: [
      {
        key: "capacity",
        title: "Intake and capacity per day",
        columns: [
          { key: "day", label: "Day" },
          { key: "sets", label: "Sets booked", numeric: true },
          { key: "intake_stu", label: "Intake (StU)", numeric: true },
          { key: "capacity_stu", label: "Capacity (StU)", numeric: true },
          { key: "load_pct", label: "Load %", numeric: true },
          { key: "over", label: "Note" },
        ],
        rows,
      },
    ],
  };
}
