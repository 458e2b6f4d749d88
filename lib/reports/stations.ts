import { localHourAt } from "./periods";
import type { Report } from "./types";

// Station throughput (pure): scan events per station and local hour of day over a period. The
// queries hand in counts per UTC hour; each falls into one local hour for a zone whose offsets
// are whole hours (as Europe/London).

export interface StationHourRow {
  station: string;
  /** The start of a UTC hour, "2026-10-31T23:00:00Z". */
  at: string;
  events: number;
}

const STATION_ORDER = ["clinic", "van", "receiving", "manual_washing", "washing", "packing", "sterilising", "release", "quality", "dispatch"];

function stationRank(station: string): number {
  const i = STATION_ORDER.indexOf(station);
  return i === -1 ? STATION_ORDER.length : i;
}

const hourLabel = (h: number) => `${String(h).padStart(2, "0")}:00`;

/** The throughput report: per station and hour, the events and the mean per day of the period. */
export function stationsReport(rows: readonly StationHourRow[], input: { timeZone: string; from: string; to: string; days: number }): Report {
  const counts = new Map<string, number[]>();
  for (const row of rows) {
    const hours = counts.get(row.station) ?? new Array<number>(24).fill(0);
    hours[localHourAt(row.at, input.timeZone)]! += row.events;
    counts.set(row.station, hours);
  }
  const stations = [...counts.keys()].sort((a, b) => stationRank(a) - stationRank(b) || a.localeCompare(b));
  const days = Math.max(1, input.days);
  const tableRows = stations.flatMap((station) =>
    counts.get(station)!.flatMap((events, hour) =>
      events === 0 ? [] : [{ station, hour: hourLabel(hour), events, per_day: (events / days).toFixed(1) }],
    ),
  );
  const total = rows.reduce((n, r) => n + r.events, 0);
  return {
    name: "stations",
    title: "Station throughput",
    notes: [
      `${total} scan${total === 1 ? "" : "s"} from ${input.from} to ${input.to} (${days} day${days === 1 ? "" : "s"}), by the hour of day they were made in unit time (${input.timeZone}).`,
      "Per day is the hour's scans divided by the days of the period, closed days included.",
    ],
    charts: [
      {
        kind: "bar",
        title: "Scans per hour of day, mean per day",
        x: "hour",
        xLabel: "Hour of day (unit time)",
        yLabel: "Scans per day",
        series: stations.map((s) => ({ key: s, label: s.replaceAll("_", " ") })),
        points: Array.from({ length: 24 }, (_, hour) => {
          const point: Record<string, string | number | null> = { hour: hourLabel(hour) };
          for (const s of stations) point[s] = Number((counts.get(s)![hour]! / days).toFixed(1));
          return point;
        }).filter((p) => stations.some((s) => (p[s] as number) > 0)),
      },
    ],
    tables: [
      {
        key: "stations",
        title: "Scans per station and hour of day",
        columns: [
          { key: "station", label: "Station" },
          { key: "hour", label: "Hour" },
          { key: "events", label: "Scans", numeric: true },
          { key: "per_day", label: "Per day", numeric: true },
        ],
        rows: tableRows,
      },
    ],
  };
}
