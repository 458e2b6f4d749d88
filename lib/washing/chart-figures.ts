import { formatBelow } from "@/lib/cycles/format";
import type { ChartAnnotations } from "@/lib/cycles/chart-geometry";
import { formatDuration } from "@/lib/machines/requirements";
import type { StoredFigures } from "./figures";

// What the cycle record chart and the one-page record show of a washer batch's check: the A0
// value, the hold at the threshold, and the lowest and highest temperature of the hold; the
// minimum temperature as the requirement line, the hold shaded, the end of disinfection marked.
// Pure.

const deg = (v: number | null) => (v === null ? "—" : `${formatBelow(v, 1)} °C`);

/** The chart's band, hold, markers and figures for a checked washer batch. */
export function washerChartParts(figures: StoredFigures): ChartAnnotations {
  const hold = figures.holdStartS !== null && figures.holdEndS !== null ? { fromT: figures.holdStartS, toT: figures.holdEndS } : undefined;
  const threshold = figures.holdThresholdC;
  return {
    band: { lowC: threshold },
    bandLabel: `${threshold} °C ${figures.requirement.kind === "time_temp" ? "minimum" : "hold threshold"}`,
    hold,
    markers: [{ t: figures.disinfectionEndS, label: "end of disinfection" }],
    figures: [
      { label: "A0", value: `${formatBelow(figures.a0, 0)} s` },
      { label: `Hold ≥ ${threshold} °C`, value: figures.holdSeconds > 0 ? formatDuration(figures.holdSeconds) : "none" },
      { label: "Min in hold", value: deg(figures.minTempC) },
      { label: "Max in hold", value: deg(figures.maxTempC) },
    ],
  };
}
