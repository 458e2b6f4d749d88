// Plain wording of times and windows for reasons shown to the dispatcher.
import type { TimeWindow } from "./types";

// Minutes from midnight as HH:MM (hours past 24 mean the next day).
export function clock(min: number): string {
  const m = Math.round(min);
  const h = Math.floor(m / 60);
  const mm = m - h * 60;
  return `${String(h).padStart(2, "0")}:${String(mm).padStart(2, "0")}`;
}

export function windowText(w: TimeWindow): string {
  return `${clock(w.startMin)}–${clock(w.endMin)}`;
}

export function windowsText(ws: readonly TimeWindow[]): string {
  return ws.map(windowText).join(", ");
}
