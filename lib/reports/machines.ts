import { localDateAt } from "./periods";
import { percent, type Report } from "./types";

// Machine use (pure): runs per machine per local day, the share of the day a machine was running,
// and the failed runs with their reasons.
//
// Decisions:
// - A run belongs to the local day it started. Utilisation is running time (start to end) over
//   the 24 hours of that day (common practice for a first look; a unit that works shorter days
//   reads it against its own hours).
// - Failed and aborted runs both count as not passed; a failed run's stored reasons are listed
//   one per row, and counted per reason.

export interface MachineRun {
  machineCode: string;
  machineName: string;
  kind: "washer" | "steriliser";
  number: string;
  status: string;
  startedAt: string;
  endedAt: string | null;
  reasons: string[];
}

const DAY_MINUTES = 24 * 60;

/** The machine-use report over the runs started in the period. */
export function machinesReport(runs: readonly MachineRun[], input: { timeZone: string; from: string; to: string; formatInstant: (iso: string) => string; notes?: string[] }): Report {
  const perDay = new Map<string, { machine: string; kind: string; day: string; runs: number; passed: number; failed: number; aborted: number; minutes: number }>();
  for (const run of runs) {
    const day = localDateAt(run.startedAt, input.timeZone);
    const key = `${run.machineCode}|${day}`;
    const entry = perDay.get(key) ?? { machine: run.machineCode, kind: run.kind, day, runs: 0, passed: 0, failed: 0, aborted: 0, minutes: 0 };
    entry.runs += 1;
    if (run.status === "passed" || run.status === "released") entry.passed += 1;
    if (run.status === "failed") entry.failed += 1;
    if (run.status === "aborted") entry.aborted += 1;
    if (run.endedAt) entry.minutes += Math.max(0, Math.round((Date.parse(run.endedAt) - Date.parse(run.startedAt)) / 60_000));
    perDay.set(key, entry);
  }
  const days = [...perDay.values()].sort((a, b) => a.machine.localeCompare(b.machine) || a.day.localeCompare(b.day));
  const machines = [...new Set(days.map((d) => d.machine))].sort();
  const dayKeys = [...new Set(days.map((d) => d.day))].sort();
  const failed = runs.filter((r) => r.status === "failed" || r.status === "aborted").sort((a, b) => a.startedAt.localeCompare(b.startedAt));
  const reasonCounts = new Map<string, number>();
  for (const run of failed) for (const reason of run.reasons.length ? run.reasons : ["(no reason recorded)"]) reasonCounts.set(reason, (reasonCounts.get(reason) ?? 0) + 1);
  return {
    name: "machines",
    title: "Machine use",
    notes: [
      `${runs.length} run${runs.length === 1 ? "" : "s"} started from ${input.from} to ${input.to}; ${failed.length} failed or aborted.`,
      "Utilisation is the running time (start to end of each run) over the 24 hours of the day it started.",
      ...(input.notes ?? []),
    ],
    charts: [
      {
        kind: "bar",
        title: "Runs per machine per day",
        x: "day",
        xLabel: "Day (unit time)",
        yLabel: "Runs",
        series: machines.map((m) => ({ key: m, label: m })),
        points: dayKeys.map((day) => {
          const point: Record<string, string | number | null> = { day: day.slice(5) };
          for (const m of machines) point[m] = perDay.get(`${m}|${day}`)?.runs ?? 0;
          return point;
        }),
      },
    ],
    tables: [
      {
        key: "days",
        title: "Runs per machine and day",
        columns: [
          { key: "machine", label: "Machine" },
          { key: "kind", label: "Kind" },
          { key: "day", label: "Day" },
          { key: "runs", label: "Runs", numeric: true },
          { key: "passed", label: "Passed", numeric: true },
          { key: "failed", label: "Failed", numeric: true },
          { key: "aborted", label: "Aborted", numeric: true },
          { key: "running_minutes", label: "Running (min)", numeric: true },
          { key: "utilisation_pct", label: "Utilisation %", numeric: true },
        ],
        rows: days.map((d) => ({
          machine: d.machine,
          kind: d.kind,
          day: d.day,
          runs: d.runs,
          passed: d.passed,
          failed: d.failed,
          aborted: d.aborted,
          running_minutes: d.minutes,
          utilisation_pct: percent(Math.min(d.minutes, DAY_MINUTES), DAY_MINUTES),
        })),
      },
      {
        key: "reasons",
        title: "Why runs failed",
        columns: [
          { key: "reason", label: "Reason" },
          { key: "runs", label: "Runs", numeric: true },
        ],
        rows: [...reasonCounts.entries()].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0])).map(([reason, n]) => ({ reason, runs: n })),
      },
      {
        key: "failed",
        title: "Failed and aborted runs",
        columns: [
          { key: "number", label: "Run" },
          { key: "machine", label: "Machine" },
          { key: "started", label: "Started" },
          { key: "status", label: "Status" },
          { key: "reasons", label: "Reasons" },
        ],
        rows: failed.map((r) => ({ number: r.number, machine: r.machineCode, started: input.formatInstant(r.startedAt), status: r.status, reasons: r.reasons.join(" ") })),
      },
    ],
  };
}
